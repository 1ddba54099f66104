// app/_server modules start with `import "server-only"`, which Next resolves to an empty
// module on the server and vitest aliases to the same (vitest.config.mts). Scripts that load
// such a module outside both — Playwright specs, the bench under tsx — import this file
// first: it registers an empty module for it in Node's module cache
// (the package itself throws when loaded without the react-server condition).
import Module from "node:module";
import path from "node:path";

const requireHere = Module.createRequire(path.join(process.cwd(), "package.json"));
const marker = requireHere.resolve("server-only");
const stub = new Module(marker);
stub.filename = marker;
stub.loaded = true;
stub.exports = {};
requireHere.cache[marker] = stub;
