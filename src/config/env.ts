import { z } from 'zod';

// The client's whole configuration, read from import.meta.env once. Nothing secret belongs behind
// VITE_: every value here ends up in the bundle.
const clientEnvSchema = z.object({
  MODE: z.string(),
  DEV: z.boolean(),
  /**
   * Path prefix of the API on this origin. It must stay same-origin: the session is an httpOnly,
   * SameSite=Strict cookie that a cross-origin request would not carry.
   */
  VITE_API_BASE: z
    .string()
    .regex(/^\/[^/]/, 'must be a path on this origin, such as /api')
    .transform((v) => v.replace(/\/+$/, ''))
    .default('/api'),
});

function loadClientEnv() {
  const parsed = clientEnvSchema.safeParse(import.meta.env);
  if (parsed.success) return parsed.data;
  const lines = parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
  throw new Error(`Invalid client configuration (VITE_* variables):\n${lines.join('\n')}`);
}

const raw = loadClientEnv();

export const env = {
  mode: raw.MODE,
  isDev: raw.DEV,
  apiBase: raw.VITE_API_BASE,
} as const;
