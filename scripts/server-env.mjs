// Lets command-line scripts import the server's data layer: "server-only" guards against
// bundling into the browser, which cannot happen in a plain Node process.
import { register } from "node:module";

register("./server-only-hook.mjs", import.meta.url);
