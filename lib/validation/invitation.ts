import { z } from "zod";
import { passwordLengthProblem } from "@/lib/security/password-length";
import { PROJECT_ROLES } from "@/lib/vocabulary";

export const invitationCreateSchema = z
  .object({
    email: z.string({ error: "E-mail is required." }).trim().toLowerCase().pipe(z.email("Not an e-mail address.")),
    role: z.enum(PROJECT_ROLES, { error: `Role must be one of: ${PROJECT_ROLES.join(", ")}.` }),
  })
  .strict();

/** A new account's name and password (an existing account only joins the project). */
export const invitationAcceptSchema = z
  .object({
    name: z.string({ error: "Your name is required." }).trim().min(1, "Your name is required.").max(120, "At most 120 characters."),
    // Length here (the browser can check it too); the common-password and guessability check runs in the DAL.
    password: z.string({ error: "A password is required." }).superRefine((v, ctx) => {
      const problem = passwordLengthProblem(v);
      if (problem) ctx.addIssue({ code: "custom", message: problem });
    }),
  })
  .strict();

export const memberPatchSchema = z.object({ role: z.enum(PROJECT_ROLES, { error: `Role must be one of: ${PROJECT_ROLES.join(", ")}.` }) }).strict();

/** Days an invitation link stays valid. */
export const INVITATION_DAYS = 7;
