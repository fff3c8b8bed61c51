import type { Server } from 'node:http';
import type { Duplex } from 'node:stream';
import type { Logger } from 'pino';

// Node's HTTP parser refuses some requests before Express sees them, and by default answers with
// a bare status line. These answers carry the one error shape instead. Codes are llhttp's (Node
// docs, "Event: 'clientError'"); statuses are RFC 6585 §5 (431) and RFC 9110 §15.5.
const PARSER_ANSWERS: Record<string, [number, string, string]> = {
  HPE_HEADER_OVERFLOW: [431, 'headers_too_large', 'The request headers are too large.'],
  ERR_HTTP_REQUEST_TIMEOUT: [408, 'request_timeout', 'The request took too long to arrive.'],
  HPE_CHUNK_EXTENSIONS_OVERFLOW: [413, 'payload_too_large', 'The request body is too large.'],
};
const BAD_REQUEST: [number, string, string] = [400, 'bad_request', 'The request could not be read.'];
const REASONS: Record<number, string> = { 400: 'Bad Request', 408: 'Request Timeout', 413: 'Payload Too Large', 431: 'Request Header Fields Too Large' };

/** The raw HTTP/1.1 answer written for a request the parser refused. */
export function clientErrorResponse(code: string | undefined): string {
  const [status, errorCode, message] = (code && PARSER_ANSWERS[code]) || BAD_REQUEST;
  const body = JSON.stringify({ error: { code: errorCode, message } });
  return [
    `HTTP/1.1 ${status} ${REASONS[status]}`,
    'Content-Type: application/json; charset=utf-8',
    `Content-Length: ${Buffer.byteLength(body)}`,
    'Cache-Control: no-store',
    'X-Content-Type-Options: nosniff',
    'Connection: close',
    '',
    body,
  ].join('\r\n');
}

/** Answers parser refusals in the one error shape, the way Node would but with a JSON body. */
export function answerClientErrors(server: Server, logger?: Logger): void {
  server.on('clientError', (err: NodeJS.ErrnoException, socket: Duplex) => {
    // As Node's own handler: nothing to answer on a reset socket, or once a response has begun.
    const inFlight = (socket as Duplex & { _httpMessage?: { headersSent?: boolean } })._httpMessage;
    if (err.code === 'ECONNRESET' || !socket.writable || inFlight?.headersSent) {
      socket.destroy();
      return;
    }
    logger?.info({ code: err.code }, 'request refused by the HTTP parser');
    socket.end(clientErrorResponse(err.code));
  });
}
