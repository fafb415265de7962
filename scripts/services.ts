/**
 * Local stand-ins for hosted services, started by `npm run dev` and `npm run demo`.
 * Each returns the environment the app needs to reach it. (The fake SMTP server joins here.)
 */
export interface LocalServices {
  env: Record<string, string>;
  stop: () => Promise<void>;
}

export async function startLocalServices(): Promise<LocalServices> {
  const stops: (() => Promise<void>)[] = [];
  const env: Record<string, string> = {};
  return { env, stop: async () => void (await Promise.all(stops.map((s) => s()))) };
}
