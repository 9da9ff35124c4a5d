import "server-only";
import { randomBytes } from "node:crypto";
import { mkdir, readFile, rename, unlink, writeFile } from "node:fs/promises";
import path from "node:path";
import { getEnv } from "@/lib/env";

/**
 * Where uploaded bytes live. Local disk under the data directory now; an object store later
 * implements the same three calls. Keys are random and never come from user input, so a
 * crafted name cannot reach outside the root.
 */
export interface FileStore {
  put(bytes: Uint8Array): Promise<string>;
  get(key: string): Promise<Buffer>;
  remove(key: string): Promise<void>;
}

const KEY_PATTERN = /^[a-f0-9]{2}\/[a-f0-9]{40}$/;

class LocalDiskStore implements FileStore {
  constructor(private readonly root: string) {}

  private pathOf(key: string): string {
    if (!KEY_PATTERN.test(key)) throw new Error("Invalid storage key");
    return path.join(this.root, key);
  }

  async put(bytes: Uint8Array): Promise<string> {
    const id = randomBytes(20).toString("hex");
    const key = `${id.slice(0, 2)}/${id}`;
    const target = this.pathOf(key);
    await mkdir(path.dirname(target), { recursive: true });
    // Write then rename: a reader never sees half a file.
    const temp = `${target}.tmp`;
    await writeFile(temp, bytes);
    await rename(temp, target);
    return key;
  }

  async get(key: string): Promise<Buffer> {
    return readFile(this.pathOf(key));
  }

  async remove(key: string): Promise<void> {
    await unlink(this.pathOf(key)).catch(() => {});
  }
}

let store: FileStore | undefined;
export function getFileStore(): FileStore {
  store ??= new LocalDiskStore(path.resolve(getEnv().DATA_DIR, "uploads"));
  return store;
}
