import { toNextJsHandler } from "better-auth/next-js";
import { getAuth } from "@/lib/auth";

// better-auth's own endpoints: sign-in, sign-out, session.
export const { GET, POST } = toNextJsHandler((req: Request) => getAuth().handler(req));
