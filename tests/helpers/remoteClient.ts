/**
 * A socket.io client in its own process (for tests that freeze or kill a peer): connects with the
 * cookie and sketch id from argv, joins, prints "joined" and then just stays.
 */
import { io } from 'socket.io-client';
import { PROTOCOL_VERSION } from '../../shared/protocol/messages.ts';

const [url, cookie, sketchId] = process.argv.slice(2);
if (url === undefined || cookie === undefined || sketchId === undefined) throw new Error('usage: remoteClient URL COOKIE SKETCH_ID');
const socket = io(url, { transports: ['websocket'], extraHeaders: { cookie }, reconnection: false });
socket.on('connect', () => socket.emit('message', { type: 'join', protocol: PROTOCOL_VERSION, sketchId }));
socket.on('message', (msg: { type: string }) => {
  if (msg.type === 'joined') console.log('joined');
});
