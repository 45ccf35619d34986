import type http from 'node:http';
import type { Duplex } from 'node:stream';

import type { Aedes, Client } from 'aedes';

/**
 * aedes 1.x has no packet size limit: a client may announce a packet of up to
 * 256 MB and the parser buffers it whole, before CONNECT. This cuts a connection
 * as soon as a packet's length field is read and is over the limit: 8 KB until the
 * client has signed in (CONNECT is small), then `maxMqttPacketBytes`.
 */
export const maxMqttPacketBytes = 512 * 1024;
export const maxConnectPacketBytes = 8 * 1024;

type ParserInternals = { packet: { length: number }; _parseLength: () => boolean };

export function handleWithLimit(aedes: Aedes, conn: Duplex, req?: http.IncomingMessage): Client {
  const client = (aedes.handle as (c: Duplex, r?: http.IncomingMessage) => Client)(conn, req);
  // the parser is internal to aedes (lib/client.js); checked by the broker tests
  const parser = (client as unknown as { _parser: ParserInternals })._parser;
  const readLength = parser._parseLength;
  parser._parseLength = function limited(this: ParserInternals) {
    const done = readLength.call(this);
    const limit = (client as unknown as { connected: boolean }).connected ? maxMqttPacketBytes : maxConnectPacketBytes;
    if (done && this.packet.length > limit) {
      conn.destroy();
      return false;
    }
    return done;
  };
  return client;
}
