/**
 * The page's Content-Security-Policy forbids eval: tell zod not to compile parsers with
 * new Function (it probes for it when a schema is built, which triggers a policy-violation
 * report). Imported first by main.tsx, so it runs before any module builds a schema.
 */
import { z } from 'zod';

z.config({ jitless: true });
