import "server-only";
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { cache } from "react";
import { getActor, type Actor } from "./actor";

/** The signed-in actor for server components (once per request); redirects to sign-in when absent. */
export const currentActor = cache(async (): Promise<Actor> => {
  const actor = await getActor(await headers());
  if (!actor) redirect("/sign-in");
  return actor;
});
