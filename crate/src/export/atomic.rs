//! Writing an output folder whole: every file goes into a new temporary folder beside the
//! target, and only when all are written is the old folder swapped out for it by renames.
//! A run that fails partway leaves the previous outputs exactly as they were, and nothing is
//! ever written through a symbolic link (files are created new, in a folder we just made).
//!
//! Native only (the page keeps its outputs in memory).

use std::fs;
use std::io::Write;
use std::path::{Path, PathBuf};
use std::sync::Mutex;
use std::thread::JoinHandle;

/// A file written and being flushed to the disk by a thread of its own.
type Syncing = (PathBuf, JoinHandle<std::io::Result<()>>);

/// An output folder being written: files go into `staging`, [`OutputDir::commit`] swaps it in.
#[derive(Debug)]
pub struct OutputDir {
    target: PathBuf,
    staging: PathBuf,
    committed: bool,
    /// Each written file's `fsync`, waited for before the swap: the wait for the disk happens
    /// while the next files are built, not on the cores' time.
    syncing: Mutex<Vec<Syncing>>,
}

fn io_err(what: &str, p: &Path, e: std::io::Error) -> String {
    format!("cannot {what} {}: {e}", p.display())
}

/// A sibling of `target` named `.{name}.{tag}-{pid}-{n}` that does not exist yet.
fn sibling(target: &Path, tag: &str) -> Result<PathBuf, String> {
    let name = target
        .file_name()
        .and_then(|n| n.to_str())
        .ok_or_else(|| format!("--out {}: give a folder name", target.display()))?;
    let parent = target.parent().unwrap_or(Path::new(""));
    for n in 0..1000 {
        let p = parent.join(format!(".{name}.{tag}-{}-{n}", std::process::id()));
        if fs::symlink_metadata(&p).is_err() {
            return Ok(p);
        }
    }
    Err(format!(
        "cannot find a free temporary name beside {}",
        target.display()
    ))
}

/// Checks that `target` can take the outputs before any work starts: it is a folder (or
/// missing), not a symbolic link, and its parent folder accepts new entries.
///
/// ```
/// let dir = std::env::temp_dir().join(format!("cw-doc-{}", std::process::id()));
/// assert!(catchwalk::export::atomic::check_out_dir(&dir.join("out")).is_err()); // no parent
/// std::fs::create_dir_all(&dir).unwrap();
/// assert!(catchwalk::export::atomic::check_out_dir(&dir.join("out")).is_ok());
/// std::fs::remove_dir_all(&dir).unwrap();
/// ```
pub fn check_out_dir(target: &Path) -> Result<(), String> {
    match fs::symlink_metadata(target) {
        Ok(m) if m.file_type().is_symlink() => {
            return Err(format!(
                "--out {} is a symbolic link; give a real folder (outputs are never written through a link)",
                target.display()
            ))
        }
        Ok(m) if !m.is_dir() => {
            return Err(format!(
                "--out {} exists and is not a folder; give a folder",
                target.display()
            ))
        }
        _ => {}
    }
    let probe = sibling(target, "probe")?;
    let parent = probe.parent().unwrap_or(Path::new(""));
    if !parent.as_os_str().is_empty() && !parent.is_dir() {
        return Err(format!(
            "--out {}: the folder {} does not exist; create it first",
            target.display(),
            parent.display()
        ));
    }
    fs::create_dir(&probe).map_err(|e| {
        format!(
            "--out {}: cannot create a folder beside it ({e}); choose a folder you can write to",
            target.display()
        )
    })?;
    let _ = fs::remove_dir(&probe);
    Ok(())
}

impl OutputDir {
    /// Starts writing the outputs of `target` (checked with [`check_out_dir`]).
    pub fn begin(target: &Path) -> Result<OutputDir, String> {
        check_out_dir(target)?;
        let staging = sibling(target, "new")?;
        fs::create_dir(&staging).map_err(|e| io_err("create", &staging, e))?;
        Ok(OutputDir {
            target: target.to_path_buf(),
            staging,
            committed: false,
            syncing: Mutex::new(Vec::new()),
        })
    }

    /// Writes one file into the new folder. The file is created new (`create_new`), so a
    /// planted link cannot be followed.
    pub fn write(&self, name: &str, text: &str) -> Result<(), String> {
        self.write_with(name, |w| w.write_all(text.as_bytes()))
    }

    /// Writes one file into the new folder through a buffer as `body` produces it (a large
    /// layer never sits whole in memory). Created new, as [`OutputDir::write`].
    pub fn write_with(
        &self,
        name: &str,
        body: impl FnOnce(&mut dyn Write) -> std::io::Result<()>,
    ) -> Result<(), String> {
        if name.contains('/') || name.contains('\\') || name.starts_with('.') {
            return Err(format!("refusing output file name {name:?}"));
        }
        let p = self.staging.join(name);
        let f = fs::OpenOptions::new()
            .write(true)
            .create_new(true)
            .open(&p)
            .map_err(|e| io_err("create", &p, e))?;
        let mut w = std::io::BufWriter::new(f);
        body(&mut w)
            .and_then(|_| w.flush())
            .map_err(|e| io_err("write", &p, e))?;
        let f = w
            .into_inner()
            .map_err(|e| io_err("write", &p, e.into_error()))?;
        let sync = std::thread::spawn(move || f.sync_all());
        self.syncing
            .lock()
            .map_err(|_| format!("writing {}: a writer thread failed", p.display()))?
            .push((p, sync));
        Ok(())
    }

    /// Waits until every file written is on the disk (the first failure is the error).
    fn wait_for_disk(&self) -> Result<(), String> {
        let pending = match self.syncing.lock() {
            Ok(mut v) => std::mem::take(&mut *v),
            Err(_) => return Err("writing the outputs: a writer thread failed".into()),
        };
        let mut first_error = None;
        for (p, sync) in pending {
            let outcome = match sync.join() {
                Ok(r) => r.map_err(|e| io_err("write", &p, e)),
                Err(_) => Err(format!("writing {}: its disk flush failed", p.display())),
            };
            if let Err(e) = outcome {
                first_error.get_or_insert(e);
            }
        }
        first_error.map_or(Ok(()), Err)
    }

    /// Swaps the new folder in: the old one (if any) is renamed aside, the new one takes its
    /// name, the old one is removed. If the second rename fails the old one is put back.
    pub fn commit(mut self) -> Result<(), String> {
        self.wait_for_disk()?;
        let old = if fs::symlink_metadata(&self.target).is_ok() {
            let aside = sibling(&self.target, "old")?;
            fs::rename(&self.target, &aside).map_err(|e| io_err("move aside", &self.target, e))?;
            Some(aside)
        } else {
            None
        };
        if let Err(e) = fs::rename(&self.staging, &self.target) {
            if let Some(aside) = &old {
                let _ = fs::rename(aside, &self.target);
            }
            return Err(io_err("move the new outputs to", &self.target, e));
        }
        self.committed = true;
        if let Some(aside) = old {
            let _ = fs::remove_dir_all(aside);
        }
        Ok(())
    }
}

impl Drop for OutputDir {
    /// A run that ends without [`OutputDir::commit`] removes its half-written folder.
    fn drop(&mut self) {
        if !self.committed {
            let _ = self.wait_for_disk();
            let _ = fs::remove_dir_all(&self.staging);
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn scratch(tag: &str) -> PathBuf {
        let d = std::env::temp_dir().join(format!("cw-atomic-{tag}-{}", std::process::id()));
        let _ = fs::remove_dir_all(&d);
        fs::create_dir_all(&d).unwrap();
        d
    }

    fn snapshot(dir: &Path) -> Vec<(String, Vec<u8>)> {
        let mut v: Vec<(String, Vec<u8>)> = fs::read_dir(dir)
            .unwrap()
            .filter_map(|e| e.ok())
            .map(|e| {
                let n = e.file_name().to_string_lossy().into_owned();
                (n, fs::read(e.path()).unwrap_or_default())
            })
            .collect();
        v.sort();
        v
    }

    #[test]
    fn a_failed_run_leaves_the_old_folder_byte_identical() {
        let d = scratch("fail");
        let out = d.join("out");
        let first = OutputDir::begin(&out).unwrap();
        first.write("a.csv", "old a").unwrap();
        first.write("b.json", "old b").unwrap();
        first.commit().unwrap();
        let before = snapshot(&out);
        let second = OutputDir::begin(&out).unwrap();
        second.write("a.csv", "new a, half").unwrap();
        // The second write fails (a name we refuse), and the run ends without commit.
        assert!(second.write("../b.json", "x").is_err());
        drop(second);
        assert_eq!(snapshot(&out), before);
        // No temporary folder is left beside it.
        assert_eq!(fs::read_dir(&d).unwrap().count(), 1);
        // A run that completes replaces the whole folder: no stale file stays.
        let third = OutputDir::begin(&out).unwrap();
        third.write("a.csv", "new a").unwrap();
        third.commit().unwrap();
        assert_eq!(snapshot(&out), vec![("a.csv".into(), b"new a".to_vec())]);
        fs::remove_dir_all(&d).unwrap();
    }

    #[cfg(unix)]
    #[test]
    fn a_planted_link_is_not_written_through() {
        let d = scratch("link");
        let victim = d.join("victim.txt");
        fs::write(&victim, "keep me").unwrap();
        let out = d.join("out");
        fs::create_dir(&out).unwrap();
        std::os::unix::fs::symlink(&victim, out.join("homes.csv")).unwrap();
        let o = OutputDir::begin(&out).unwrap();
        o.write("homes.csv", "new table").unwrap();
        o.commit().unwrap();
        assert_eq!(fs::read_to_string(&victim).unwrap(), "keep me");
        assert!(!fs::symlink_metadata(out.join("homes.csv"))
            .unwrap()
            .file_type()
            .is_symlink());
        // --out itself a link: refused before anything is written.
        let link_out = d.join("link-out");
        std::os::unix::fs::symlink(&out, &link_out).unwrap();
        let e = check_out_dir(&link_out).unwrap_err();
        assert!(e.contains("symbolic link"), "{e}");
        fs::remove_dir_all(&d).unwrap();
    }

    #[test]
    fn an_unusable_out_is_refused_up_front() {
        let d = scratch("bad");
        let file = d.join("file");
        fs::write(&file, "x").unwrap();
        assert!(check_out_dir(&file).unwrap_err().contains("not a folder"));
        let e = check_out_dir(&d.join("missing/out")).unwrap_err();
        assert!(e.contains("does not exist"), "{e}");
        fs::remove_dir_all(&d).unwrap();
    }
}
