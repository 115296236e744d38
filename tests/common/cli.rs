//! One way to run the `nonet` binary in tests: a scratch directory from `tempfile` (removed
//! on drop) for NONET_CONFIG_DIR and NONET_DATA_DIR, so no real user sets or sessions are
//! read, LANG=C.UTF-8 unless a test says otherwise, and no LC_ALL / LC_CTYPE.

use std::io::Write;
use std::path::{Path, PathBuf};
use std::process::{Command, Output, Stdio};

use serde_json::Value;

pub const BIN: &str = env!("CARGO_BIN_EXE_nonet");

/// A fresh, uniquely named directory (from `tempfile`) that outlives the handle, for tests
/// that hand paths to several processes; such tests remove it when they end.
pub fn scratch_dir(tag: &str) -> PathBuf {
    tempfile::Builder::new()
        .prefix(&format!("nonet-test-{tag}-"))
        .tempdir()
        .expect("create scratch dir")
        .keep()
}

/// The binary with its data directory `data` and config directory `data/config`, no stdin.
pub fn command(data: &Path) -> Command {
    let mut c = Command::new(BIN);
    c.env("NONET_DATA_DIR", data)
        .env("NONET_CONFIG_DIR", data.join("config"))
        .stdin(Stdio::null());
    c
}

/// A scratch directory for one test's runs.
pub struct Scratch {
    dir: tempfile::TempDir,
}

impl Scratch {
    /// `tag` names the directory, to find it while a test runs.
    pub fn new(tag: &str) -> Scratch {
        let dir = tempfile::Builder::new()
            .prefix(&format!("nonet-test-{tag}-"))
            .tempdir()
            .expect("create scratch dir");
        std::fs::create_dir_all(dir.path().join("config")).expect("create config dir");
        Scratch { dir }
    }

    pub fn path(&self) -> &Path {
        self.dir.path()
    }

    pub fn config(&self) -> PathBuf {
        self.path().join("config")
    }

    /// The data directory sessions go to.
    pub fn data(&self) -> PathBuf {
        self.path().join("data")
    }

    pub fn write(&self, name: &str, bytes: &[u8]) -> PathBuf {
        let p = self.path().join(name);
        if let Some(parent) = p.parent() {
            std::fs::create_dir_all(parent).expect("create scratch subdir");
        }
        std::fs::write(&p, bytes).expect("write scratch file");
        p
    }

    /// Put a user ligand set into $NONET_CONFIG_DIR/ligand_sets/.
    pub fn user_set(&self, name: &str, text: &str) -> PathBuf {
        let dir = self.config().join("ligand_sets");
        std::fs::create_dir_all(&dir).expect("create user set dir");
        let p = dir.join(name);
        std::fs::write(&p, text).expect("write user set");
        p
    }

    pub fn cmd(&self) -> Command {
        self.cmd_lang(Some("C.UTF-8"))
    }

    pub fn cmd_lang(&self, lang: Option<&str>) -> Command {
        let mut c = Command::new(BIN);
        c.env("NONET_CONFIG_DIR", self.config())
            .env("NONET_DATA_DIR", self.data())
            .env("XDG_CONFIG_HOME", self.path().join("xdg"))
            .env_remove("LC_ALL")
            .env_remove("LC_CTYPE")
            .env_remove("LANGUAGE");
        match lang {
            Some(l) => c.env("LANG", l),
            None => c.env_remove("LANG"),
        };
        c
    }

    pub fn run(&self, args: &[&str]) -> Run {
        Run::from(self.cmd().args(args).output().expect("run nonet"))
    }

    pub fn run_stdin(&self, args: &[&str], input: &[u8]) -> Run {
        let mut child = self
            .cmd()
            .args(args)
            .stdin(Stdio::piped())
            .stdout(Stdio::piped())
            .stderr(Stdio::piped())
            .spawn()
            .expect("spawn nonet");
        let mut stdin = child.stdin.take().expect("stdin");
        let input = input.to_vec();
        let writer = std::thread::spawn(move || {
            // nonet may stop reading early (a refused line); that is its business
            let _ = stdin.write_all(&input);
        });
        let out = child.wait_with_output().expect("wait for nonet");
        let _ = writer.join();
        Run::from(out)
    }
}

/// What a run gave.
pub struct Run {
    pub code: Option<i32>,
    pub stdout: String,
    pub stderr: String,
    pub raw_stdout: Vec<u8>,
}

impl From<Output> for Run {
    fn from(o: Output) -> Run {
        Run {
            code: o.status.code(),
            stdout: String::from_utf8_lossy(&o.stdout).into_owned(),
            stderr: String::from_utf8_lossy(&o.stderr).into_owned(),
            raw_stdout: o.stdout,
        }
    }
}

impl Run {
    pub fn show(&self) -> String {
        format!(
            "exit {:?}\n--- stdout ---\n{}\n--- stderr ---\n{}",
            self.code, self.stdout, self.stderr
        )
    }

    pub fn json_lines(&self) -> Vec<Value> {
        self.stdout
            .lines()
            .map(|l| {
                serde_json::from_str(l)
                    .unwrap_or_else(|e| panic!("not JSON ({e}): {l:?}\n{}", self.show()))
            })
            .collect()
    }
}
