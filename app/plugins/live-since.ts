// When this document's data was read, for the live connection's first handshake
// (server/utils/live-since.ts): the server's clock as it starts the render, before any of the
// page's reads, carried to the browser in the payload. A document from the tablet's offline
// copy carries its old time, so its first connection reads the page again.
export default defineNuxtPlugin(() => {
  useState<number | null>('live-since', () => (import.meta.server ? Date.now() : null))
})
