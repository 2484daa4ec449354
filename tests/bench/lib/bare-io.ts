// A bare socket.io server for the realtime benchmark's side-by-side figure: POST /emit
// broadcasts the request body to every connected client as a 'live' event and answers 204.
// No session, no database: what socket.io itself costs on this machine. Run as a child process
// (like the app server) so the clients and the server do not share one event loop; it prints
// its port on the first line of stdout.
import { createServer } from 'node:http'
import { Server } from 'socket.io'

const http = createServer((req, res) => {
  if (req.method !== 'POST' || req.url !== '/emit') {
    res.statusCode = 404
    res.end()
    return
  }
  const chunks: Buffer[] = []
  req.on('data', c => chunks.push(c))
  req.on('end', () => {
    io.emit('live', JSON.parse(Buffer.concat(chunks).toString('utf8')))
    res.statusCode = 204
    res.end()
  })
})
const io = new Server(http, { serveClient: false })
http.listen(0, '127.0.0.1', () => {
  const addr = http.address()
  console.log(typeof addr === 'object' && addr ? addr.port : 0)
})
process.on('SIGTERM', () => {
  io.close()
  process.exit(0)
})
