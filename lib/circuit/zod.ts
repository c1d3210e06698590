/**
 * zod, configured once for every realm that imports it (server, browser, Web Workers): `jitless`
 * keeps zod from compiling parsers with `new Function`, which the app's content security policy
 * forbids (without it zod's probe for eval shows as a CSP violation in the browser). Modules that
 * define schemas import `z` from here, so the setting is in place before their first schema.
 */
import { z } from 'zod';

z.config({ jitless: true });

export { z };
