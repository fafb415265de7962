import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { UserAdmin } from "@/components/admin/user-admin";
import { AppHeader } from "@/components/layout/app-header";
import { currentActor } from "@/lib/dal/session";
import { listUsers } from "@/lib/dal/users";

export const metadata: Metadata = { title: "Accounts" };

/** Site admins manage accounts here (others get the 404 page). */
export default async function AdminUsersPage() {
  const actor = await currentActor();
  if (!actor.isAdmin) notFound();
  const users = await listUsers(actor);
  return (
    <>
      <AppHeader actor={actor} />
      <main className="mx-auto max-w-6xl space-y-4 px-4 py-8">
        <h1 className="text-2xl font-semibold">Accounts</h1>
        <UserAdmin users={users} me={actor.userId} />
      </main>
    </>
  );
}
