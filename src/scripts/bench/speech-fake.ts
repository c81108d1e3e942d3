/**
 * The speech-to-text stand-in for a benchmark, as a child process (like fakes.ts):
 * `node --import tsx speech-fake.ts <port> <api key>`. It finds the speech but recognises no
 * words, as in the end-to-end stack. Prints `ready` once it listens; stops when told (SIGTERM) or
 * when the parent's end of stdin closes.
 */
import { startSpeechFake } from '../../../fakes/speech/server';

const [port, apiKey] = process.argv.slice(2);
const speech = await startSpeechFake({ port: Number(port), apiKey });
let closing = false;
const close = () => {
	if (closing) return;
	closing = true;
	void speech.close().then(() => process.exit(0));
};
process.on('SIGTERM', close);
// Ctrl+C reaches the whole process group; the parent decides when the stand-in goes.
process.on('SIGINT', () => {});
process.stdin.on('end', close);
process.stdin.resume();
process.stdout.write('ready\n');
