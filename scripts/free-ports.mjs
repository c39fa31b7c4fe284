// Prints N free loopback TCP ports, one per line.
import net from 'node:net';

const count = Number(process.argv[2] ?? 1);
const servers = [];
for (let i = 0; i < count; i++) {
  const server = net.createServer();
  await new Promise((resolve) => server.listen(0, '127.0.0.1', resolve));
  servers.push(server);
}
for (const s of servers) console.log(s.address().port);
await Promise.all(servers.map((s) => new Promise((r) => s.close(r))));
