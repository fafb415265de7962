import type { Metadata } from "next";
import { TeamManager } from "@/components/members/team-manager";
import { listMembers } from "@/lib/dal/members";
import { currentActor, orNotFound } from "@/lib/dal/session";

export const metadata: Metadata = { title: "Team" };

export default async function MembersPage({ params }: { params: Promise<{ projectId: string }> }) {
  const { projectId } = await params;
  const actor = await currentActor();
  const { members, invitations, canManage } = await orNotFound(listMembers(actor, projectId));
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold">Team</h1>
      <TeamManager
        projectId={projectId}
        selfId={actor.userId}
        canManage={canManage}
        members={members.map((m) => ({ ...m, since: m.since.toISOString() }))}
        invitations={(invitations ?? []).map((i) => ({ ...i, expiresAt: i.expiresAt.toISOString(), createdAt: i.createdAt.toISOString() }))}
      />
    </div>
  );
}
