// Unit-test set-up: load the parts the app fetches on demand — zod's schemas (stored data, imports)
// and the unit conversions (mathjs, for °F) — so that tests may use them synchronously, as the app
// does once they have arrived.
import { loadSchemas } from '../src/state/persistence';
import { loadUnitConversions } from '../src/components/format';

await Promise.all([loadSchemas(), loadUnitConversions()]);
