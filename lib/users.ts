import { getAuth } from "@/lib/auth";

/**
 * Creates a user with an email + password credential through better-auth's own adapter and hasher
 * (used by the demo seed, invitations and tests; public sign-up is off).
 */
export async function createUserWithPassword(input: { email: string; name: string; password: string; siteRole?: "admin" | "user" }) {
  const ctx = await getAuth().$context;
  const existing = await ctx.internalAdapter.findUserByEmail(input.email.toLowerCase());
  if (existing) throw new Error(`A user with e-mail ${input.email} exists already.`);
  const user = await ctx.internalAdapter.createUser({
    email: input.email.toLowerCase(),
    name: input.name,
    emailVerified: true,
    role: input.siteRole ?? "user",
  }, { method: "admin" });
  const hash = await ctx.password.hash(input.password);
  await ctx.internalAdapter.linkAccount({ userId: user.id, providerId: "credential", accountId: user.id, password: hash });
  return user;
}

/** Replaces a user's password (invitation acceptance). */
export async function setPassword(userId: string, password: string) {
  const ctx = await getAuth().$context;
  const hash = await ctx.password.hash(password);
  await ctx.internalAdapter.updatePassword(userId, hash);
}
