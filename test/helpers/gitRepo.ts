/**
 * A throwaway git repository in a temporary folder, for the revision tests: commits with fixed author and committer
 * dates (so histories are the same on every run), no global or system git configuration read.
 */
import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";

export interface GitRepo {
  readonly root: string;
  /** Writes a file (relative path), creating folders. */
  write(path: string, text: string): void;
  /** Stages everything and commits with the given ISO date; returns the commit hash. */
  commit(message: string, dateIso: string): string;
  git(...args: string[]): string;
}

export function gitEnv(dateIso?: string): NodeJS.ProcessEnv {
  return {
    ...process.env,
    GIT_CONFIG_NOSYSTEM: "1",
    GIT_CONFIG_GLOBAL: "/dev/null",
    GIT_AUTHOR_NAME: "Test",
    GIT_AUTHOR_EMAIL: "test@example.invalid",
    GIT_COMMITTER_NAME: "Test",
    GIT_COMMITTER_EMAIL: "test@example.invalid",
    ...(dateIso ? { GIT_AUTHOR_DATE: dateIso, GIT_COMMITTER_DATE: dateIso } : {}),
  };
}

export function makeGitRepo(root = mkdtempSync(join(tmpdir(), "armdex-git-"))): GitRepo {
  const git = (...args: string[]) =>
    execFileSync("git", ["-c", "init.defaultBranch=main", ...args], { cwd: root, env: gitEnv(), encoding: "utf8" });
  git("init", "-q");
  return {
    root,
    write(path, text) {
      mkdirSync(dirname(join(root, path)), { recursive: true });
      writeFileSync(join(root, path), text);
    },
    commit(message, dateIso) {
      execFileSync("git", ["add", "-A"], { cwd: root, env: gitEnv(dateIso) });
      execFileSync("git", ["commit", "-q", "-m", message], { cwd: root, env: gitEnv(dateIso) });
      return git("rev-parse", "HEAD").trim();
    },
    git,
  };
}
