import { z } from "zod";

export const signInRequestSchema = z.object({
  email: z.email({ error: "Enter an e-mail address like name@example.com." }).max(254, { error: "That e-mail address is too long." }),
  callbackUrl: z
    .string()
    .optional()
    .transform((value) => (value && value.startsWith("/") && !value.startsWith("//") ? value : "/")),
});

export type SignInRequest = z.infer<typeof signInRequestSchema>;
