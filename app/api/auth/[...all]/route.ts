import { getAuth } from "@/lib/auth";
import { guardedAuthRequest } from "@/lib/dal/sign-in";

// better-auth's own endpoints: sign-in, sign-out, session. Sign-in and reset attempts are throttled per account and
// per real client address and audited (lib/dal/sign-in.ts).
const handle = (req: Request) => guardedAuthRequest(req, (r) => getAuth().handler(r));
export const GET = handle;
export const POST = handle;
