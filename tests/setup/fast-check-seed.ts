// Property tests run on a fixed seed so that CI is repeatable; a failure names its seed and path.
// Explore other seeds with PROPERTY_SEED=<n> npx vitest run (the import and solver fuzz tests keep
// their own FUZZ_SEED).
import fc from 'fast-check';

fc.configureGlobal({ seed: Number(process.env.PROPERTY_SEED ?? 20_261_203) });
