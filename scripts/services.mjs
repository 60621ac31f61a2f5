// npm run services:start | services:stop | services:status
import { services, startServices, stopServices } from './lib/services.mjs'

const command = process.argv[2]
try {
  if (command === 'start') {
    await startServices()
  }
  else if (command === 'stop') {
    await stopServices()
  }
  else if (command !== 'status') {
    console.error('usage: node scripts/services.mjs start|stop|status')
    process.exit(2)
  }
  for (const service of services) {
    const s = await service.status()
    console.log(`${service.name.padEnd(10)} ${s.running ? `running (pid ${s.pid})` : 'stopped'}  ${s.running ? s.detail : ''}`)
  }
}
catch (error) {
  console.error(`[quillfield] ${error instanceof Error ? error.message : error}`)
  process.exit(1)
}
