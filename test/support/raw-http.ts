import { connect } from 'node:net';

/** Writes raw bytes and reads until the server closes: status, headers and the parsed body. */
export function rawRequest(at: number, bytes: string): Promise<{ status: number; headers: Record<string, string>; body: unknown }> {
  return new Promise((resolve, reject) => {
    const socket = connect(at, '127.0.0.1');
    let got = '';
    socket.setEncoding('latin1');
    socket.on('data', (c: string) => (got += c));
    socket.on('error', reject);
    socket.on('close', () => {
      const [head = '', body = ''] = got.split('\r\n\r\n');
      const [statusLine = '', ...lines] = head.split('\r\n');
      const headers = Object.fromEntries(lines.map((l) => [l.slice(0, l.indexOf(':')).toLowerCase(), l.slice(l.indexOf(':') + 1).trim()]));
      let parsed: unknown = body;
      try {
        parsed = JSON.parse(body);
      } catch {
        // left as text, so the assertion shows what came back
      }
      resolve({ status: Number(statusLine.split(' ')[1]), headers, body: parsed });
    });
    socket.write(bytes);
  });
}
