import { z } from "zod";

// Validated once, at first use, so a wrong variable fails loudly with its name.
const schema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  DATABASE_URL: z.string().min(1).default("file:data/papin.db"),
  DATABASE_AUTH_TOKEN: z.string().optional(),
  NEXTAUTH_SECRET: z.string().min(16, "NEXTAUTH_SECRET must be at least 16 characters").optional(),
  PAPIN_DEMO: z.enum(["0", "1"]).default("1"),
  PAPIN_DEMO_PASSWORD: z.string().min(8).default("papin-demo"),
  RESEND_API_KEY: z.string().optional(),
  RESEND_BASE_URL: z.string().url().optional(),
  PAPIN_MAIL_FROM: z.string().default("Papin <papin@papin.example>"),
  PAPIN_UPLOAD_LIMIT_MB: z.coerce.number().positive().max(500).default(50),
});

export type Env = z.infer<typeof schema>;

let cached: Env | undefined;

export function env(): Env {
  if (cached) return cached;
  const parsed = schema.safeParse(process.env);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ");
    throw new Error(`Papin's configuration is invalid: ${problems}`);
  }
  cached = parsed.data;
  return cached;
}

export function demoEnabled(): boolean {
  return env().PAPIN_DEMO !== "0";
}
