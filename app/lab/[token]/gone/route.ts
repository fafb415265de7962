import { AppError } from "@/lib/dal/errors";
import { resolveLabToken } from "@/lib/dal/lab-links";

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);

const page = (title: string, message: string) => `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><meta name="robots" content="noindex"><meta name="referrer" content="no-referrer"><title>${title} · Lithodex</title>
<style>body{font-family:system-ui,sans-serif;background:#f6f4ef;color:#17313a;margin:0;padding:3rem 1rem}main{max-width:36rem;margin:auto;background:#fff;border:1px solid #ddd8cd;border-radius:.5rem;padding:1.5rem}h1{font-size:1.4rem;margin:0 0 .5rem}p{line-height:1.5}</style></head>
<body><main><h1>${title}</h1><p>${message}</p><p>Ask the project team that sent the samples for a new link.</p></main></body></html>`;

// GET /lab/:token/gone — the answer for a revoked or expired lab link: 410 with the reason (an active link goes back to its page; unknown 404)
export async function GET(req: Request, ctx: { params: Promise<{ token: string }> }): Promise<Response> {
  const { token } = await ctx.params;
  const headers = { "content-type": "text/html; charset=utf-8", "cache-control": "no-store", "referrer-policy": "no-referrer" };
  try {
    await resolveLabToken(token);
    return Response.redirect(new URL(`/lab/${encodeURIComponent(token)}`, req.url), 307);
  } catch (err) {
    if (err instanceof AppError && err.code === "gone") {
      const title = err.details?.reason === "revoked" ? "This lab link was withdrawn" : "This lab link has expired";
      return new Response(page(title, escapeHtml(err.message)), { status: 410, headers });
    }
    if (err instanceof AppError && err.code === "not_found") return new Response(page("Link not found", "There is no lab submission at this address."), { status: 404, headers });
    throw err;
  }
}
