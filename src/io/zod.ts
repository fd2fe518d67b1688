/**
 * zod as every schema of the program uses it, configured before any schema is built: parsing
 * without generated code (`jitless`). A command parses a recipe, a lab profile or a log once;
 * zod's generated parsers (one `new Function` per object schema, compiled on its first parse and
 * never in the bundle's code cache) cost more start-up than they save. Import `z` from here.
 */
import { z } from 'zod';

z.config({ jitless: true });

export { z };
