// Property tests run on a fixed seed unless FC_SEED says otherwise, so `npm test` gives the same
// verdict on every run of the same code (docs/decisions/010). FC_SEED=random explores fresh cases;
// FC_SEED=<integer> replays a run (fast-check prints the seed and path of any failure).
import fc from 'fast-check';

const DEFAULT_SEED = 20_261_202;
const raw = process.env.FC_SEED;
if (raw !== 'random') {
  const seed = raw === undefined || raw === '' ? DEFAULT_SEED : Number(raw);
  if (!Number.isInteger(seed)) throw new Error(`FC_SEED must be an integer or "random", got "${raw}"`);
  fc.configureGlobal({ ...fc.readConfigureGlobal(), seed });
}
