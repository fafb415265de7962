import { currentActor } from "@/lib/dal/session";

export default async function AppLayout({ children }: { children: React.ReactNode }) {
  await currentActor();
  return <div className="min-h-screen">{children}</div>;
}
