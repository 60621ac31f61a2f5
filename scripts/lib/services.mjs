// The services the application needs, each with the same idempotent lifecycle:
// status() → { running, pid, detail }, start() → true when it started it, stop().
import { mariadb } from './mariadb.mjs'
import { mailbox } from './mailbox.mjs'
import { objectstore } from './objectstore.mjs'

export const services = [mariadb, objectstore, mailbox]

/** Starts every service; returns the ones this call started (so a caller can stop just those). */
export async function startServices() {
  const started = []
  for (const service of services) {
    if (await service.start()) started.push(service)
  }
  return started
}

export async function stopServices(list = services) {
  for (const service of [...list].reverse()) await service.stop()
}
