/**
 * The reference for the captions endpoint: a plain node:http server answering every GET with one
 * file, read from disk per request as a static file server does, with the headers the endpoint
 * sends, and 304 for a matching If-None-Match. Run as a child process by bench-captions.ts:
 * `node --import tsx static-server.ts <file> <port> <headers as JSON>`; prints `ready`.
 */
import { createReadStream, statSync } from 'node:fs';
import { createServer } from 'node:http';

const [file, port, headersJson] = process.argv.slice(2);
const headers = JSON.parse(headersJson) as Record<string, string>;
// Like sirv in adapter-node: the size and tag are known up front, the bytes come from the file.
const size = statSync(file).size;
const etag = headers.ETag;

const server = createServer((req, res) => {
	if (req.method !== 'GET') {
		res.writeHead(405).end();
		return;
	}
	if (req.headers['if-none-match'] === etag) {
		const rest = { ...headers };
		delete rest['Content-Type'];
		res.writeHead(304, rest).end();
		return;
	}
	res.writeHead(200, { ...headers, 'Content-Length': String(size) });
	createReadStream(file).pipe(res);
});
server.listen(Number(port), '127.0.0.1', () => process.stdout.write('ready\n'));
process.on('SIGTERM', () => process.exit(0));
// Ctrl+C reaches the whole process group; the parent decides when this server goes.
process.on('SIGINT', () => {});
process.stdin.on('end', () => process.exit(0));
process.stdin.resume();
