#!/usr/bin/env node
// Entry point of `npm start`, `npm test`, `npm run dev` and `npm run bench`.
// Plain Node (builtins only): the dependencies may not be installed yet. It installs them when
// node_modules is missing or older than package-lock.json, then hands over to
// `tsx scripts/<command>.ts` (node --import tsx), forwarding signals and the exit code.
import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const COMMANDS = {
  start: 'start.ts',
  test: 'test.ts',
  dev: 'dev.ts',
  bench: 'bench.ts',
  backup: 'backup.ts',
  restore: 'restore.ts',
  'audit-verify': 'audit-verify.ts',
};

function fail(message, code = 1) {
  console.error(`[tacklog] ${message}`);
  process.exit(code);
}

function mtime(file) {
  try {
    return fs.statSync(file).mtimeMs;
  } catch {
    return null;
  }
}

const [command, ...args] = process.argv.slice(2);
const script = COMMANDS[command];
if (!script) fail(`usage: node scripts/bootstrap.mjs <${Object.keys(COMMANDS).join('|')}> [args...]`, 2);

const [major, minor] = process.versions.node.split('.').map(Number);
if (major < 20 || (major === 20 && minor < 19)) {
  fail(`Tacklog needs Node.js 20.19 or newer; this is ${process.version}.`);
}

/** node_modules is usable when npm's own record of it is at least as new as the lockfile. */
function dependenciesStale() {
  const lock = path.join(root, 'package-lock.json');
  const installed = mtime(path.join(root, 'node_modules', '.package-lock.json'));
  if (installed === null || !fs.existsSync(path.join(root, 'node_modules', '.bin', 'tsx'))) return true;
  // npm may write package-lock.json a moment after node_modules/.package-lock.json: allow 5 s.
  return installed + 5000 < (mtime(lock) ?? 0);
}

function npm(npmArgs) {
  // Under `npm run`, npm_execpath is npm's own CLI: use the same npm that started us.
  const execPath = process.env.npm_execpath;
  const [cmd, cmdArgs] = execPath && /\.(c|m)?js$/.test(execPath) ? [process.execPath, [execPath, ...npmArgs]] : ['npm', npmArgs];
  console.log(`[tacklog] npm ${npmArgs.join(' ')}`);
  const result = spawnSync(cmd, cmdArgs, { cwd: root, stdio: 'inherit', env: process.env });
  if (result.error) fail(`could not run npm: ${result.error.message}`);
  if (result.status !== 0) fail(`npm ${npmArgs.join(' ')} failed (exit ${result.status ?? result.signal}).`);
}

if (dependenciesStale()) {
  const hasLock = fs.existsSync(path.join(root, 'package-lock.json'));
  console.log('[tacklog] installing dependencies (node_modules is missing or older than package-lock.json)');
  npm(hasLock ? ['ci', '--no-audit', '--no-fund'] : ['install', '--no-audit', '--no-fund']);
}

const scriptPath = path.join(root, 'scripts', script);
if (!fs.existsSync(scriptPath)) fail(`scripts/${script} does not exist yet.`);

// tsx loaded into this one node process (`node --import tsx`, what node_modules/.bin/tsx does
// without its extra parent process): tsx's CLI parent relays signals and SIGKILLs a child that
// does not confirm one within 30 ms, which could kill a script before it stops its cluster.
const child = spawn(process.execPath, ['--import', 'tsx', scriptPath, ...args], { cwd: root, stdio: 'inherit', env: process.env });

// Forward termination signals. (Ctrl-C in a terminal reaches the child directly too; the
// scripts' handlers are idempotent.)
for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP']) {
  process.on(signal, () => {
    if (child.exitCode === null && child.signalCode === null) child.kill(signal);
  });
}

child.on('error', (err) => fail(`could not start ${script}: ${err.message}`));
child.on('exit', (code, signal) => {
  if (signal) process.exit(128 + (os.constants.signals[signal] ?? 1));
  process.exit(code ?? 1);
});
