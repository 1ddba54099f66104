// Which process listens on a local TCP port, and how much memory it holds, read from /proc
// (Linux): the socket's inode from /proc/net/tcp{,6}, then the process holding that inode
// among its open files. Used by browser tests to watch the `next start` server that
// Playwright started (its pid is not handed to the specs).
import { readdirSync, readFileSync, readlinkSync } from "node:fs";

function listeningInodes(port: number): Set<string> {
  const inodes = new Set<string>();
  const hexPort = port.toString(16).toUpperCase().padStart(4, "0");
  for (const table of ["/proc/net/tcp", "/proc/net/tcp6"]) {
    let text = "";
    try {
      text = readFileSync(table, "utf8");
    } catch {
      continue;
    }
    for (const line of text.split("\n").slice(1)) {
      const cols = line.trim().split(/\s+/);
      // cols[1] local address "IP:PORT", cols[3] state (0A = LISTEN), cols[9] inode
      if (cols.length > 9 && cols[1].endsWith(`:${hexPort}`) && cols[3] === "0A") inodes.add(cols[9]);
    }
  }
  return inodes;
}

/** The pid of the process listening on 127.0.0.1:`port` (or any address), or throws. */
export function listeningPid(port: number): number {
  const inodes = listeningInodes(port);
  if (!inodes.size) throw new Error(`nothing listens on port ${port}`);
  for (const entry of readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    let fds: string[];
    try {
      fds = readdirSync(`/proc/${entry}/fd`);
    } catch {
      continue;
    }
    for (const fd of fds) {
      try {
        const m = /^socket:\[(\d+)\]$/.exec(readlinkSync(`/proc/${entry}/fd/${fd}`));
        if (m && inodes.has(m[1])) return Number(entry);
      } catch {
        // the descriptor closed while we looked
      }
    }
  }
  throw new Error(`no process found holding the socket that listens on port ${port}`);
}

/** Resident memory of a process in bytes (VmRSS from /proc/<pid>/status). */
export function residentBytes(pid: number): number {
  const m = /^VmRSS:\s+(\d+)\s+kB$/m.exec(readFileSync(`/proc/${pid}/status`, "utf8"));
  if (!m) throw new Error(`no VmRSS for process ${pid}`);
  return Number(m[1]) * 1024;
}
