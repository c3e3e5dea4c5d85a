import { register } from 'node:module';
register('./resolve_shim.mjs', import.meta.url);
