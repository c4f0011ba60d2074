import fs from 'node:fs';

/**
 * Makes the build's `server/entry.mjs` Sluice's own HTTP front (./front.mjs, with its helpers
 * ./client-address.mjs beside it), with the node
 * adapter's entry renamed `app.mjs` (astro.config's `build.serverEntry`). Everything that runs
 * `<build>/server/entry.mjs` gets the front without knowing it.
 */
export function httpFront() {
  let serverDir;
  return {
    name: 'sluice-http-front',
    hooks: {
      'astro:config:done': ({ config }) => {
        serverDir = config.build.server;
        if (config.build.serverEntry !== 'app.mjs') throw new Error('sluice-http-front needs build.serverEntry = "app.mjs"');
      },
      'astro:build:done': () => {
        fs.copyFileSync(new URL('./front.mjs', import.meta.url), new URL('entry.mjs', serverDir));
        fs.copyFileSync(new URL('./client-address.mjs', import.meta.url), new URL('client-address.mjs', serverDir));
      },
    },
  };
}
