import "server-only";
import { headers } from "next/headers";
import { notFound, redirect } from "next/navigation";
import { cache } from "react";
import { getActor, type Actor } from "./actor";
import { AppError } from "./errors";

/** The signed-in actor for server components (once per request); redirects to sign-in when absent. */
export const currentActor = cache(async (): Promise<Actor> => {
  const actor = await getActor(await headers());
  if (!actor) redirect("/sign-in");
  return actor;
});

/** For pages: a missing or forbidden record renders the 404 page, so other projects' records stay invisible. */
export async function orNotFound<T>(promise: Promise<T>): Promise<T> {
  try {
    return await promise;
  } catch (err) {
    if (err instanceof AppError && (err.code === "not_found" || err.code === "forbidden")) notFound();
    throw err;
  }
}
