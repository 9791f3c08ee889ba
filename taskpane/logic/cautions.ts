/**
 * The cautions the side panel shows from every section: the usual ways an A/B read-out misleads, in
 * our own words. Plain data.
 */

/** One caution: a short title and what to do about it. */
export interface Caution {
  readonly id: string;
  readonly title: string;
  readonly text: string;
}

/** The cautions, in the order shown. */
export const CAUTIONS: readonly Caution[] = Object.freeze([
  {
    id: 'peeking',
    title: 'Looking early and stopping early',
    text: 'Checking the read-out every day and stopping the first time a variant looks good makes false winners much more common than the threshold suggests. Decide the number of visitors (Plan) before starting, and act on the read-out when the test has run its course. Expected loss is less fragile than a probability threshold, but it does not make early stopping free.',
  },
  {
    id: 'split',
    title: 'A broken split',
    text: 'If the visitors per variant are far from the planned shares (SRM p-value below 0.001), something in how visitors are assigned or counted is broken: bots, redirects, caching, a variant that crashes. The variants then hold different kinds of visitors and no read-out can be trusted until the cause is found.',
  },
  {
    id: 'prior',
    title: 'How much the prior matters',
    text: 'A prior worth many visitors pulls every variant towards its mean. Try the read-out with the uniform prior (alpha = beta = 1) as well: if the decision changes, the data alone do not settle the question yet, and that should be said.',
  },
  {
    id: 'variants',
    title: 'Many variants',
    text: "With many challengers, one of them will look good by luck alone. The probability of being highest accounts for the others; the Plan section splits the chance of a false winner over the challengers, so each variant needs more visitors than in a test of two. Even so, the winner's lead usually shrinks on a second run: confirm a surprising winner before building on it.",
  },
  {
    id: 'novelty',
    title: 'Novelty and habit',
    text: 'Returning visitors may react to anything new for a while, or dislike a change at first. Run the test over whole weeks, and compare the first days with the later ones before trusting a lift.',
  },
  {
    id: 'regulated',
    title: 'Decisions about health, money owed or other regulated matters',
    text: "Where a decision affects people's health, safety, credit or legal rights, or falls under regulation, do not rely on this read-out alone: ask a qualified statistician and follow the rules that apply where you work.",
  },
]);
