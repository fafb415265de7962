/**
 * Stamps the TCP peer address on every incoming HTTP request as `x-lithodex-peer` (overwriting a client-sent value),
 * through Node's `http.server.request.start` diagnostics channel, which fires before the server's request handler.
 * Next.js route handlers do not see the socket; this is how the sign-in throttle gets the real address without
 * trusting X-Forwarded-For.
 */
import diagnostics_channel from "node:diagnostics_channel";
import type { IncomingMessage } from "node:http";
import type { Socket } from "node:net";
import { PEER_HEADER } from "./client-address";

export function installPeerAddressStamp(): void {
  const g = globalThis as unknown as { __lithodexPeerStamp?: boolean };
  if (g.__lithodexPeerStamp) return;
  g.__lithodexPeerStamp = true;
  diagnostics_channel.subscribe("http.server.request.start", (message) => {
    const { request, socket } = message as { request: IncomingMessage; socket?: Socket };
    const addr = socket?.remoteAddress ?? request.socket?.remoteAddress;
    if (addr) request.headers[PEER_HEADER] = addr;
    else delete request.headers[PEER_HEADER];
  });
}
