import { AppHeader } from "@/components/layout/app-header";
import { currentActor } from "@/lib/dal/session";

export default async function LibraryLayout({ children }: { children: React.ReactNode }) {
  const actor = await currentActor();
  return (
    <>
      <AppHeader actor={actor}>
        <span className="hidden text-sm font-medium text-ink md:block">Reference library</span>
      </AppHeader>
      <main className="mx-auto max-w-7xl px-4 py-6">{children}</main>
    </>
  );
}
