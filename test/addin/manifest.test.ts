/**
 * Offline structure check of manifest/manifest.xml (office-addin-manifest's validator calls a remote
 * service, so it is not used in tests). The element orders below are the xs:sequence orders of the
 * add-in manifest schemas (OfficeAppManifestV1_1.xsd and TaskPaneAppVersionOverridesV1_0.xsd), as
 * documented in Microsoft's "How to find the proper order of manifest elements" and the [MS-OWEMXML]
 * schema pages, for the elements this manifest uses.
 */
import * as fs from 'fs';
import * as path from 'path';
import { XMLParser } from 'fast-xml-parser';
import { CATALOGUE_LIST } from '../../functions/catalogue';

/* eslint-disable @typescript-eslint/no-require-imports */
const help = require('../../help/build') as { wrapperFiles(): string[] };
const writer = require('../../manifest/writeManifest') as {
  DEV_BASE_URL: string;
  normaliseBaseUrl(raw: string): string;
  rewriteManifest(xml: string, baseUrl: string): string;
  rewriteMetadata(json: string, baseUrl: string): string;
};
/* eslint-enable @typescript-eslint/no-require-imports */

const XML = fs.readFileSync(path.join(__dirname, '..', '..', 'manifest', 'manifest.xml'), 'utf8');

type Node = Record<string, unknown>;
/** fast-xml-parser's preserveOrder form: [{ tag: [children], ':@': { attributes } }] */
type Ordered = Node[];

function parseOrdered(xml: string): Ordered {
  return new XMLParser({
    preserveOrder: true,
    ignoreAttributes: false,
    attributeNamePrefix: '',
    commentPropName: '#comment',
  }).parse(xml) as Ordered;
}

function tagOf(node: Node): string {
  return Object.keys(node).find((k) => k !== ':@') as string;
}
function childrenOf(node: Node): Ordered {
  return (node[tagOf(node)] as Ordered).filter((c) => tagOf(c) !== '#text' && tagOf(c) !== '#comment');
}
function attrs(node: Node): Record<string, string> {
  return (node[':@'] as Record<string, string>) ?? {};
}
function child(node: Node, tag: string): Node {
  const found = childrenOf(node).find((c) => tagOf(c) === tag);
  if (!found) throw new Error(`<${tagOf(node)}> has no <${tag}>`);
  return found;
}
function path_(node: Node, ...tags: string[]): Node {
  return tags.reduce(child, node);
}
function allNodes(nodes: Ordered, out: Node[] = []): Node[] {
  for (const n of nodes) {
    const tag = tagOf(n);
    if (tag === '#text' || tag === '#comment') continue;
    out.push(n);
    allNodes(n[tag] as Ordered, out);
  }
  return out;
}

/** Checks that the children's tags appear in the schema's order (optional ones may be absent). */
function expectOrder(node: Node, schemaOrder: readonly string[]): void {
  const tags = childrenOf(node).map(tagOf);
  for (const t of tags)
    expect({ parent: tagOf(node), child: t, known: schemaOrder.includes(t) }).toEqual({
      parent: tagOf(node),
      child: t,
      known: true,
    });
  const positions = tags.map((t) => schemaOrder.indexOf(t));
  expect({ parent: tagOf(node), tags }).toEqual({
    parent: tagOf(node),
    tags: [...tags].sort((a, b) => schemaOrder.indexOf(a) - schemaOrder.indexOf(b)),
  });
  expect(positions).toEqual([...positions].sort((a, b) => a - b));
}

const doc = parseOrdered(XML);
const officeApp = doc.find((n) => tagOf(n) === 'OfficeApp') as Node;
const overrides = child(officeApp, 'VersionOverrides');
const host = path_(overrides, 'Hosts', 'Host');
const resources = child(overrides, 'Resources');

describe('element order per the schema', () => {
  test('OfficeApp (TaskPaneApp)', () => {
    expect(attrs(officeApp)['xsi:type']).toBe('TaskPaneApp');
    expectOrder(officeApp, [
      'Id',
      'AlternateId',
      'Version',
      'ProviderName',
      'DefaultLocale',
      'DisplayName',
      'Description',
      'IconUrl',
      'HighResolutionIconUrl',
      'SupportUrl',
      'AppDomains',
      'Hosts',
      'Requirements',
      'DefaultSettings',
      'Permissions',
      'AllowSnapshot',
      'VersionOverrides',
    ]);
  });

  test('VersionOverrides 1.0', () => {
    expect(attrs(overrides)['xsi:type']).toBe('VersionOverridesV1_0');
    expect(attrs(overrides).xmlns).toBe('http://schemas.microsoft.com/office/taskpaneappversionoverrides');
    expectOrder(overrides, ['Description', 'Requirements', 'Hosts', 'Resources']);
  });

  test('Host (Workbook): Runtimes, AllFormFactors, DesktopFormFactor', () => {
    expect(attrs(host)['xsi:type']).toBe('Workbook');
    expectOrder(host, ['Runtimes', 'AllFormFactors', 'DesktopFormFactor']);
    expect(childrenOf(host).map(tagOf)).toEqual(['Runtimes', 'AllFormFactors', 'DesktopFormFactor']);
  });

  test('CustomFunctions extension point: Script, Page, Metadata, Namespace', () => {
    const point = path_(host, 'AllFormFactors', 'ExtensionPoint');
    expect(attrs(point)['xsi:type']).toBe('CustomFunctions');
    expect(childrenOf(point).map(tagOf)).toEqual(['Script', 'Page', 'Metadata', 'Namespace']);
  });

  test('DesktopFormFactor, ribbon group and button', () => {
    const desktop = child(host, 'DesktopFormFactor');
    expectOrder(desktop, ['GetStarted', 'FunctionFile', 'ExtensionPoint']);
    expectOrder(child(desktop, 'GetStarted'), ['Title', 'Description', 'LearnMoreUrl']);
    const group = path_(desktop, 'ExtensionPoint', 'OfficeTab', 'Group');
    expectOrder(group, ['Label', 'Icon', 'Control']);
    const button = child(group, 'Control');
    expect(attrs(button)['xsi:type']).toBe('Button');
    expectOrder(button, ['Label', 'Supertip', 'Icon', 'Action']);
    expectOrder(child(button, 'Supertip'), ['Title', 'Description']);
    const action = child(button, 'Action');
    expect(attrs(action)['xsi:type']).toBe('ShowTaskpane');
    expectOrder(action, ['TaskpaneId', 'SourceLocation', 'Title']);
  });

  test('Resources: Images, Urls, ShortStrings, LongStrings', () => {
    expectOrder(resources, ['bt:Images', 'bt:Urls', 'bt:ShortStrings', 'bt:LongStrings']);
  });
});

describe('content', () => {
  const resourceIds = new Map<string, string>();
  for (const group of childrenOf(resources)) {
    for (const item of childrenOf(group)) resourceIds.set(attrs(item).id as string, attrs(item).DefaultValue as string);
  }

  test('every resid resolves to a defined resource and every resid is at most 32 characters', () => {
    const used = allNodes(doc)
      .map((n) => attrs(n).resid)
      .filter((r): r is string => typeof r === 'string');
    expect(used.length).toBeGreaterThan(10);
    for (const resid of used) {
      expect({ resid, defined: resourceIds.has(resid), short: resid.length <= 32 }).toEqual({
        resid,
        defined: true,
        short: true,
      });
    }
  });

  test('resource ids are unique', () => {
    const ids = childrenOf(resources).flatMap((g) => childrenOf(g).map((i) => attrs(i).id));
    expect(new Set(ids).size).toBe(ids.length);
  });

  test('every URL is https', () => {
    const urls = XML.replace(/<!--[\s\S]*?-->/g, '').match(/(?:DefaultValue="|<AppDomain>)(\w+:\/\/[^"<]+)/g) ?? [];
    expect(urls.length).toBeGreaterThan(8);
    for (const u of urls) expect(u).toMatch(/(?:DefaultValue="|<AppDomain>)https:\/\//);
  });

  test('the namespace is ABTEST and the script and metadata are dist/functions.js and functions.json', () => {
    const point = path_(host, 'AllFormFactors', 'ExtensionPoint');
    expect(resourceIds.get(attrs(child(point, 'Namespace')).resid as string)).toBe('ABTEST');
    expect(resourceIds.get(attrs(path_(point, 'Script', 'SourceLocation')).resid as string)).toBe(
      'https://localhost:3000/functions.js',
    );
    expect(resourceIds.get(attrs(path_(point, 'Metadata', 'SourceLocation')).resid as string)).toBe(
      'https://localhost:3000/functions.json',
    );
  });

  test('shared runtime: one long-lived runtime on Taskpane.Url, used by the page, function file and button', () => {
    const runtime = path_(host, 'Runtimes', 'Runtime');
    expect(attrs(runtime)).toEqual({ resid: 'Taskpane.Url', lifetime: 'long' });
    expect(attrs(path_(host, 'AllFormFactors', 'ExtensionPoint', 'Page', 'SourceLocation')).resid).toBe('Taskpane.Url');
    expect(attrs(path_(host, 'DesktopFormFactor', 'FunctionFile')).resid).toBe('Taskpane.Url');
    const sets = childrenOf(path_(officeApp, 'Requirements', 'Sets')).map(
      (s) => `${attrs(s).Name} ${attrs(s).MinVersion}`,
    );
    expect(sets).toEqual(['SharedRuntime 1.1', 'CustomFunctionsRuntime 1.1', 'ExcelApi 1.12']);
  });

  test('id, version, names and icons', () => {
    expect(String((child(officeApp, 'Id').Id as Ordered)[0]?.['#text'])).toMatch(
      /^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/,
    );
    expect(String((child(officeApp, 'Version').Version as Ordered)[0]?.['#text'])).toMatch(/^\d+\.\d+\.\d+\.\d+$/);
    expect(attrs(child(officeApp, 'DisplayName')).DefaultValue).toBe('Lift Ledger');
    expect((attrs(child(officeApp, 'Description')).DefaultValue ?? '').length).toBeGreaterThan(40);
    expect(resourceIds.get('Group.Label')).toBe('Experiments');
    expect(resourceIds.get('OpenPanel.Label')).toBe('Open Lift Ledger');
    for (const size of [16, 32, 80])
      expect(resourceIds.get(`Icon.${size}x${size}`)).toBe(`https://localhost:3000/assets/icon-${size}.png`);
  });
});

describe('production manifest', () => {
  test('every development URL moves to the base URL, the AppDomain to its origin', () => {
    const out = writer.rewriteManifest(XML, 'https://addins.example.org/lift-ledger');
    const body = out.replace(/<!--[\s\S]*?-->/g, '');
    expect(body).not.toMatch(/localhost/);
    expect(body).toContain('DefaultValue="https://addins.example.org/lift-ledger/functions.js"');
    expect(body).toContain('DefaultValue="https://addins.example.org/lift-ledger/assets/icon-80.png"');
    expect(body).toContain('<AppDomain>https://addins.example.org</AppDomain>');
    // structure unchanged
    const rewritten = parseOrdered(out).find((n) => tagOf(n) === 'OfficeApp') as Node;
    expect(allNodes([rewritten]).map(tagOf)).toEqual(allNodes([officeApp]).map(tagOf));
  });

  test('help URLs in functions.json move to the base URL too', async () => {
    const { generateCustomFunctionsMetadata } = await import('custom-functions-metadata');
    const generated = await generateCustomFunctionsMetadata(help.wrapperFiles(), false);
    const moved = JSON.parse(
      writer.rewriteMetadata(generated.metadataJson, 'https://addins.example.org/lift-ledger'),
    ) as {
      functions: { id: string; helpUrl: string }[];
    };
    expect(moved.functions).toHaveLength(CATALOGUE_LIST.length);
    for (const f of moved.functions) expect(f.helpUrl).toBe(`https://addins.example.org/lift-ledger/help/${f.id}.html`);
  }, 60000);

  test('the dev URL gives the manifest back unchanged', () => {
    expect(writer.rewriteManifest(XML, writer.DEV_BASE_URL)).toBe(XML);
  });

  test('base URLs must be absolute https without query or fragment', () => {
    expect(() => writer.normaliseBaseUrl('http://example.org/')).toThrow(
      'ADDIN_BASE_URL "http://example.org/" must use https (Office loads add-ins over https only)',
    );
    expect(() => writer.normaliseBaseUrl('example.org')).toThrow('ADDIN_BASE_URL "example.org" is not an absolute URL');
    expect(() => writer.normaliseBaseUrl('https://example.org/?x=1')).toThrow('must not have a query or fragment');
    expect(writer.normaliseBaseUrl('https://example.org/a')).toBe('https://example.org/a/');
  });
});
