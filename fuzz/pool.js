/**
 * A pool of fuzzer children (child.js) with a watchdog.
 *
 * Each child runs one call at a time, so a child that dies or hangs is tied to exactly one input:
 * - a call still running when it has used `budgetMs` of CPU is killed (SIGKILL) and reported as over
 *   budget; the CPU time is read from /proc on Linux, so a call slowed only by a busy machine is given
 *   more wall time (up to `maxWallFactor` × the budget), elsewhere the wall time decides. A call killed
 *   at that wall-time cap before it used its CPU budget is run once more in a fresh child before it is
 *   reported (the machine, not the call, may have been slow);
 * - a child that exits during a call (an engine abort such as "Fatal JavaScript invalid size error", or
 *   the bounded heap running out) is reported with the last lines of its stderr;
 * in both cases a fresh child takes its place and the run goes on.
 */
'use strict';
const fs = require('fs');
const path = require('path');
const { fork } = require('child_process');

const CHILD = path.join(__dirname, 'child.js');
const STDERR_KEEP = 8192;

/** User + system CPU time (µs) of a process from /proc, or undefined where /proc is not available. */
function procCpuUs(pid) {
  try {
    const stat = fs.readFileSync(`/proc/${pid}/stat`, 'utf8');
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    // fields[11], fields[12]: utime and stime in clock ticks (fields 14 and 15 of proc(5))
    return ((Number(fields[11]) + Number(fields[12])) * 1e6) / TICKS_PER_SECOND;
  } catch {
    return undefined;
  }
}
// Linux's USER_HZ is 100 on every architecture Node supports.
const TICKS_PER_SECOND = 100;

/** The first line of a child's stderr that says why it died. */
function abortReason(stderr, code, signal) {
  const lines = stderr
    .split('\n')
    .map((l) => l.replace(/^#\s*/, '').trim())
    .filter(Boolean);
  const fatal =
    lines.find((l) => /Fatal JavaScript|FATAL ERROR|out of memory|heap limit|[Aa]llocation failed/.test(l)) ||
    lines.find((l) => /fatal/i.test(l));
  if (fatal) return fatal.replace(/\s+\d{6,}$/, '');
  if (signal) return `killed by ${signal}`;
  return `exited with code ${code}`;
}

class Worker {
  constructor(pool, index) {
    this.pool = pool;
    this.index = index;
    this.child = undefined;
    this.task = undefined;
    this.ready = undefined;
    this.isReady = false;
    this.spawns = 0;
  }

  spawn() {
    const { bundle, heapMb } = this.pool.options;
    this.spawns += 1;
    this.isReady = false;
    const child = fork(CHILD, [bundle], {
      execArgv: [`--max-old-space-size=${heapMb}`, '--expose-gc'],
      serialization: 'advanced',
      stdio: ['ignore', 'ignore', 'pipe', 'ipc'],
    });
    this.child = child;
    this.stderr = '';
    child.stderr.setEncoding('utf8');
    child.stderr.on('data', (chunk) => {
      this.stderr = (this.stderr + chunk).slice(-STDERR_KEEP);
    });
    this.ready = new Promise((resolve, reject) => {
      const onEarlyExit = (code, signal) =>
        reject(
          new Error(
            `a fuzzer child could not load the bundle (${abortReason(this.stderr, code, signal)}):\n` +
              this.stderr.trim(),
          ),
        );
      child.once('exit', onEarlyExit);
      child.once('message', (message) => {
        child.removeListener('exit', onEarlyExit);
        this.cpuTotalUs = message.cpuTotalUs;
        this.functions = message.functions;
        this.isReady = true;
        child.on('message', (m) => this.onMessage(m));
        child.on('exit', (code, signal) => this.onExit(child, code, signal));
        resolve(message);
      });
    });
    return this.ready;
  }

  run(task) {
    this.task = task;
    task.started = Date.now();
    task.cpuAtStartUs = this.cpuTotalUs;
    this.armWatchdog(this.pool.options.budgetMs);
    this.child.send({ id: task.id, fn: task.call.fn, args: task.call.args });
  }

  armWatchdog(delayMs) {
    clearTimeout(this.timer);
    this.timer = setTimeout(() => this.onWatchdog(), Math.max(5, delayMs));
  }

  onWatchdog() {
    const task = this.task;
    if (!task) return;
    const { budgetMs, maxWallFactor } = this.pool.options;
    const wallMs = Date.now() - task.started;
    const now = procCpuUs(this.child.pid);
    const cpuMs = now === undefined || task.cpuAtStartUs === undefined ? undefined : (now - task.cpuAtStartUs) / 1000;
    if (cpuMs !== undefined && cpuMs < budgetMs && wallMs < budgetMs * maxWallFactor) {
      this.armWatchdog(budgetMs - cpuMs + 10);
      return;
    }
    task.killed = { wallMs, cpuMs };
    this.isReady = false;
    this.child.kill('SIGKILL');
  }

  onMessage(message) {
    const task = this.task;
    if (!task || message.id !== task.id) return;
    clearTimeout(this.timer);
    this.cpuTotalUs = message.cpuTotalUs;
    this.task = undefined;
    const result = { ...message };
    delete result.id;
    delete result.cpuTotalUs;
    task.resolve(result);
    // a result that arrived while the watchdog was killing the child still counts; the child does not
    if (this.isReady) this.pool.next(this);
  }

  onExit(child, code, signal) {
    if (child !== this.child) return;
    clearTimeout(this.timer);
    const task = this.task;
    this.task = undefined;
    this.child = undefined;
    this.isReady = false;
    if (this.pool.closing) return;
    if (task) {
      if (
        task.killed &&
        task.killed.cpuMs !== undefined &&
        task.killed.cpuMs < this.pool.options.budgetMs &&
        !task.retried
      ) {
        task.retried = true;
        task.killed = undefined;
        this.pool.queue.unshift(task);
      } else if (task.killed) {
        task.resolve({
          outcome: 'timeout',
          wallMs: task.killed.wallMs,
          cpuMs: task.killed.cpuMs ?? task.killed.wallMs,
          stalled: task.killed.cpuMs !== undefined && task.killed.cpuMs < this.pool.options.budgetMs,
        });
      } else {
        task.resolve({
          outcome: 'abort',
          reason: abortReason(this.stderr, code, signal),
          stderr: this.stderr.slice(-2000),
          wallMs: Date.now() - task.started,
        });
      }
    }
    this.spawn()
      .then(() => this.pool.next(this))
      .catch((error) => this.pool.fail(error));
  }
}

class Pool {
  /**
   * @param {{ bundle: string, jobs: number, budgetMs: number, heapMb: number, maxWallFactor?: number }} options
   */
  constructor(options) {
    // the wall-time cap only catches a call that stalls without using CPU; on a machine shared by many
    // processes a call may get a few per cent of a core, so the cap is generous
    this.options = { maxWallFactor: 60, ...options };
    this.queue = [];
    this.workers = [];
    this.nextId = 0;
    this.closing = false;
    this.failure = undefined;
  }

  /** Starts the children; resolves with the ids the bundle registered. */
  async start() {
    for (let i = 0; i < this.options.jobs; i++) this.workers.push(new Worker(this, i));
    const ready = await Promise.all(this.workers.map((w) => w.spawn()));
    return ready[0].functions;
  }

  /** Runs one call ({ fn, args }); resolves with its result, never rejects for what the call does. */
  run(call) {
    if (this.failure) return Promise.reject(this.failure);
    return new Promise((resolve, reject) => {
      this.queue.push({ id: this.nextId++, call, resolve, reject });
      const idle = this.workers.find((w) => w.isReady && !w.task);
      if (idle) this.next(idle);
    });
  }

  next(worker) {
    if (worker.task || !worker.isReady || this.closing) return;
    const task = this.queue.shift();
    if (task) worker.run(task);
  }

  fail(error) {
    this.failure = error;
    for (const task of this.queue.splice(0)) task.reject(error);
  }

  /** How many children were started in all (first starts and respawns). */
  get spawns() {
    return this.workers.reduce((s, w) => s + w.spawns, 0);
  }

  async close() {
    this.closing = true;
    await Promise.all(
      this.workers.map(
        (w) =>
          new Promise((resolve) => {
            clearTimeout(w.timer);
            if (!w.child || w.child.exitCode !== null || w.child.signalCode !== null) return resolve();
            w.child.once('exit', () => resolve());
            w.child.kill('SIGKILL');
          }),
      ),
    );
  }
}

module.exports = { Pool, abortReason };
