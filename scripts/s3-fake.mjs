// The local S3-compatible object store used in development and tests (s3rver), bound to 127.0.0.1.
// Started in the background by scripts/lib/objectstore.mjs; stops on SIGTERM.
import S3rver from 's3rver'

const [port, directory, buckets] = process.argv.slice(2)
const server = new S3rver({
  port: Number(port),
  address: '127.0.0.1',
  directory,
  silent: true,
  configureBuckets: buckets.split(',').map(name => ({ name })),
})
await server.run()
process.stdout.write(`object store on http://127.0.0.1:${port} (buckets ${buckets}, data in ${directory})\n`)
const stop = async () => {
  await server.close()
  process.exit(0)
}
process.on('SIGTERM', stop)
process.on('SIGINT', stop)
