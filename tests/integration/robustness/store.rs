//! Fault tests of the profile store: a save that cannot write (read-only directory, full disk)
//! fails cleanly and leaves the old file; a process killed while saving leaves the old or the
//! new file whole; a file changed by another program is not overwritten without asking; two
//! store instances saving at once never leave a file that does not parse.
//!
//! The full-disk and crash cases run this test binary again as a child process (the tests
//! marked `#[ignore]` below, which do nothing unless the parent sets their variable).

use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::sync::Arc;
use std::sync::atomic::{AtomicBool, Ordering};
use std::time::{Duration, Instant};
use tidewright::profile::store::PendingSave;
use tidewright::profile::{BoatDoc, ProfileError, Quantity, Store};

/// The variable that tells a child test which store to work on.
const CHILD_STORE_VAR: &str = "TIDEWRIGHT_ROBUSTNESS_CHILD_STORE";
/// The demo boat the fault tests save over.
const BOAT: &str = "pintle";

/// A store in a fresh temporary directory, filled with the demo fleet.
fn demo_store() -> (tempfile::TempDir, Store) {
    let dir = tempfile::tempdir().expect("temporary directory");
    let store = Store::at(dir.path().join("profiles"));
    store.init().expect("init the demo fleet");
    (dir, store)
}

/// The boat's document with its tank enlarged by `litres`, so that saves differ.
fn with_larger_tank(doc: &BoatDoc, litres: f64) -> BoatDoc {
    let mut edited = doc.clone();
    edited.trip.tank = Quantity::new(doc.trip.tank.value + litres * 1e-3);
    edited
}

/// The files in `dir` whose names mark them as the store's temporary files.
fn temporaries(dir: &Path) -> Vec<PathBuf> {
    std::fs::read_dir(dir)
        .expect("read the directory")
        .map(|entry| entry.expect("directory entry").path())
        .filter(|path| {
            let name = path.file_name().unwrap_or_default().to_string_lossy();
            name.starts_with(".tidewright-") && name.ends_with(".tmp")
        })
        .collect()
}

/// Runs the `#[ignore]`d test `name` of this binary as a child with the store `root`, through
/// `sh -c` with `shell_setup` run first (e.g. a resource limit). Returns the child, running.
fn spawn_child(name: &str, root: &Path, shell_setup: &str) -> std::process::Child {
    let exe = std::env::current_exe().expect("the test binary's path");
    let script = format!("{shell_setup}\nexec \"$0\" \"$@\"");
    Command::new("sh")
        .arg("-c")
        .arg(script)
        .arg(exe)
        .args([
            name,
            "--exact",
            "--ignored",
            "--nocapture",
            "--test-threads=1",
        ])
        .env(CHILD_STORE_VAR, root)
        .stdin(Stdio::null())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("spawn the test binary as a child")
}

/// Makes a directory unwritable, and undoes it when dropped (so the temporary dir can go).
struct ReadOnlyDir {
    path: PathBuf,
    immutable: bool,
}

impl ReadOnlyDir {
    /// Takes write access away from `path`: by permission bits, or — where those do not bind,
    /// as for root — with the immutable attribute. `Err` says why neither works here.
    fn new(path: &Path) -> Result<Self, String> {
        use std::os::unix::fs::PermissionsExt;
        let probe = path.join(".probe");
        std::fs::set_permissions(path, std::fs::Permissions::from_mode(0o555))
            .map_err(|e| format!("chmod failed: {e}"))?;
        let mut guard = Self {
            path: path.to_owned(),
            immutable: false,
        };
        if std::fs::write(&probe, b"x").is_err() {
            return Ok(guard);
        }
        // Permission bits do not stop this user (root): try the immutable attribute instead.
        let _ = std::fs::remove_file(&probe);
        let chattr = Command::new("chattr").arg("+i").arg(path).output();
        match chattr {
            Ok(out) if out.status.success() => guard.immutable = true,
            Ok(out) => {
                return Err(format!(
                    "permission bits do not bind this user and chattr +i failed: {}",
                    String::from_utf8_lossy(&out.stderr).trim()
                ));
            }
            Err(e) => {
                return Err(format!(
                    "permission bits do not bind this user and chattr is not available: {e}"
                ));
            }
        }
        if std::fs::write(&probe, b"x").is_ok() {
            let _ = std::fs::remove_file(&probe);
            return Err(
                "neither permission bits nor chattr +i make the directory read-only".into(),
            );
        }
        Ok(guard)
    }
}

impl Drop for ReadOnlyDir {
    fn drop(&mut self) {
        use std::os::unix::fs::PermissionsExt;
        if self.immutable {
            let _ = Command::new("chattr").arg("-i").arg(&self.path).status();
        }
        let _ = std::fs::set_permissions(&self.path, std::fs::Permissions::from_mode(0o755));
    }
}

#[test]
fn a_save_into_a_read_only_directory_fails_and_keeps_the_old_file() {
    let (_dir, store) = demo_store();
    let loaded = store.load_boat(BOAT).unwrap();
    let path = store.boat_path(BOAT).unwrap();
    let boats_dir = path.parent().unwrap().to_owned();
    let before = std::fs::read(&path).unwrap();
    let edited = with_larger_tank(&loaded.doc, 10.0);
    let guard = match ReadOnlyDir::new(&boats_dir) {
        Ok(guard) => guard,
        Err(reason) => {
            println!("skipped: cannot make a directory read-only here: {reason}");
            return;
        }
    };
    let error = store
        .save_boat(BOAT, &edited, loaded.origin.stamp(), false)
        .expect_err("a save into a read-only directory must fail");
    assert!(matches!(error, ProfileError::Write { .. }), "{error}");
    let message = error.to_string();
    assert!(
        message.contains("cannot write") && message.contains(BOAT),
        "{message}"
    );
    drop(guard);
    assert_eq!(
        std::fs::read(&path).unwrap(),
        before,
        "the old file changed"
    );
    assert!(temporaries(&boats_dir).is_empty());
    assert_eq!(store.load_boat(BOAT).unwrap().doc, loaded.doc);
    // Writable again, the same save goes through.
    store
        .save_boat(BOAT, &edited, loaded.origin.stamp(), false)
        .unwrap();
}

#[test]
fn a_store_whose_directory_is_a_regular_file_fails_to_save_without_panicking() {
    let dir = tempfile::tempdir().unwrap();
    let blocker = dir.path().join("profiles");
    std::fs::write(&blocker, b"not a directory").unwrap();
    let boat = Store::at("/nonexistent/tidewright-demo")
        .load_boat(BOAT)
        .unwrap();
    let store = Store::at(&blocker);
    let error = store
        .save_boat(BOAT, &boat.doc, None, false)
        .expect_err("a store under a regular file cannot be written");
    assert!(error.to_string().contains("profiles"), "{error}");
    assert_eq!(std::fs::read(&blocker).unwrap(), b"not a directory");
}

#[test]
fn a_save_onto_a_full_disk_fails_and_keeps_the_old_file() {
    // A full disk is simulated with a file-size limit of one block for the saving process:
    // its first write past the limit fails (EFBIG, with SIGXFSZ ignored) as a write onto a full
    // disk fails with ENOSPC — part of the new content may be written, then an error.
    let (_dir, store) = demo_store();
    let path = store.boat_path(BOAT).unwrap();
    let before = std::fs::read(&path).unwrap();
    let root = store.root().unwrap();
    let child = spawn_child(
        "robustness::store::child_saves_once",
        root,
        "trap '' XFSZ\nulimit -f 1",
    );
    let output = child.wait_with_output().unwrap();
    let stdout = String::from_utf8_lossy(&output.stdout);
    assert!(
        stdout.contains("save failed:"),
        "the limited save did not fail:\n{stdout}\n{}",
        String::from_utf8_lossy(&output.stderr)
    );
    assert!(stdout.contains("cannot write"), "{stdout}");
    assert_eq!(
        std::fs::read(&path).unwrap(),
        before,
        "the old file changed"
    );
    assert!(
        temporaries(path.parent().unwrap()).is_empty(),
        "a temporary was left"
    );
    assert!(
        !path.with_extension("toml.bak").exists(),
        "a backup was made of a failed save"
    );
    // Without the limit the same child saves.
    let output = spawn_child("robustness::store::child_saves_once", root, "")
        .wait_with_output()
        .unwrap();
    assert!(String::from_utf8_lossy(&output.stdout).contains("saved"));
    assert_ne!(std::fs::read(&path).unwrap(), before);
}

/// Child of the full-disk test: one save of an edited boat, its outcome printed.
#[test]
#[ignore = "run as a child process by a_save_onto_a_full_disk_fails_and_keeps_the_old_file"]
fn child_saves_once() {
    let Some(root) = std::env::var_os(CHILD_STORE_VAR) else {
        return;
    };
    let store = Store::at(PathBuf::from(root));
    let loaded = store.load_boat(BOAT).unwrap();
    let edited = with_larger_tank(&loaded.doc, 10.0);
    match store.save_boat(BOAT, &edited, loaded.origin.stamp(), false) {
        Ok(saved) => println!("saved {}", saved.path.display()),
        Err(error) => println!("save failed: {error}"),
    }
}

#[test]
fn a_crash_between_writing_and_renaming_leaves_the_old_file_and_a_harmless_temporary() {
    let (_dir, store) = demo_store();
    let loaded = store.load_boat(BOAT).unwrap();
    let path = store.boat_path(BOAT).unwrap();
    let before = std::fs::read(&path).unwrap();
    let edited = with_larger_tank(&loaded.doc, 25.0);
    let pending: PendingSave = store
        .prepare_boat(BOAT, &edited, loaded.origin.stamp(), false)
        .unwrap();
    // A crash runs no destructor: the synced temporary stays, the rename never happens.
    std::mem::forget(pending);
    let boats_dir = path.parent().unwrap();
    let stray = temporaries(boats_dir);
    assert_eq!(stray.len(), 1, "{stray:?}");
    // Saved values are rounded to their unit (0.1 L here), so compare within that.
    let stray_tank = BoatDoc::from_toml(&std::fs::read_to_string(&stray[0]).unwrap(), "stray")
        .unwrap()
        .trip
        .tank
        .value;
    assert!(
        (stray_tank - edited.trip.tank.value).abs() < 0.05e-3,
        "the temporary holds the whole new content: {stray_tank} m3"
    );
    assert_eq!(std::fs::read(&path).unwrap(), before);
    assert_eq!(store.load_boat(BOAT).unwrap().doc, loaded.doc);
    assert!(
        !store
            .list_boats()
            .unwrap()
            .iter()
            .any(|name| name.contains("tidewright"))
    );
    // A crash also leaves the save lock, naming a process that is then gone: here one that
    // has ended, as after a restart.
    let lock = boats_dir.join(format!(".{BOAT}.toml.lock"));
    assert!(lock.exists());
    let mut ended = Command::new("true").spawn().unwrap();
    ended.wait().unwrap();
    std::fs::write(&lock, format!("{}\n", ended.id())).unwrap();
    // The next save, after the "restart", works and the leftovers do not get in the way.
    let started = Instant::now();
    let saved = store
        .save_boat(BOAT, &edited, loaded.origin.stamp(), false)
        .unwrap();
    assert!(started.elapsed() < Duration::from_secs(1));
    assert!(!lock.exists());
    // The save that died left its temporary; this save of the same boat removed it.
    assert!(!stray[0].exists(), "{:?} left behind", stray[0]);
    assert!(temporaries(boats_dir).is_empty());
    assert_eq!(std::fs::read(saved.backup.unwrap()).unwrap(), before);
    let reloaded = store.load_boat(BOAT).unwrap().doc.trip.tank.value;
    assert!(
        (reloaded - edited.trip.tank.value).abs() < 0.05e-3,
        "{reloaded} m3"
    );
}

#[test]
fn a_process_killed_while_saving_leaves_the_old_or_the_new_file_whole() {
    // The child saves two versions in turn as fast as it can; it is killed (SIGKILL, no
    // clean-up of any kind) at a different moment each round.
    let (_dir, store) = demo_store();
    let root = store.root().unwrap().to_owned();
    let original = store.load_boat(BOAT).unwrap().doc;
    let allowed: Vec<f64> = [0.0, 1.0, 2.0]
        .iter()
        .map(|litres| with_larger_tank(&original, *litres).trip.tank.value)
        .collect();
    let path = store.boat_path(BOAT).unwrap();
    let mut saves_seen = 0;
    for round in 0..6u64 {
        let mut child = spawn_child("robustness::store::child_saves_forever", &root, "");
        let started = Instant::now();
        // Wait for the child to be inside its save loop, then a little more each round.
        let stdout = child.stdout.take().unwrap();
        let mut reader = std::io::BufReader::new(stdout);
        let mut said = String::new();
        while !said.ends_with("saving\n") {
            let read = std::io::BufRead::read_line(&mut reader, &mut said).unwrap();
            assert!(read > 0, "the child ended before saving: {said:?}");
        }
        std::thread::sleep(Duration::from_millis(3 + 7 * round));
        child.kill().unwrap();
        child.wait().unwrap();
        assert!(started.elapsed() < Duration::from_secs(5));
        let text = std::fs::read_to_string(&path).expect("the boat file exists after a kill");
        let doc = BoatDoc::from_toml(&text, "after-kill.toml")
            .unwrap_or_else(|e| panic!("round {round}: the file does not parse: {e}\n{text}"));
        assert!(
            allowed.contains(&doc.trip.tank.value),
            "round {round}: tank {} is neither the old nor a new version",
            doc.trip.tank.value
        );
        if doc.trip.tank.value != allowed[0] {
            saves_seen += 1;
        }
        // The backup, when there is one, is whole too.
        let backup = path.with_extension("toml.bak");
        if backup.exists() {
            BoatDoc::from_toml(&std::fs::read_to_string(&backup).unwrap(), "backup.toml")
                .expect("the backup parses");
        }
    }
    assert!(
        saves_seen > 0,
        "the child never completed a save: the test proved nothing"
    );
}

/// Child of the kill test: saves the boat with its tank +1 L and +2 L in turn, forever.
#[test]
#[ignore = "run as a child process by a_process_killed_while_saving_leaves_the_old_or_the_new_file_whole"]
fn child_saves_forever() {
    let Some(root) = std::env::var_os(CHILD_STORE_VAR) else {
        return;
    };
    let store = Store::at(PathBuf::from(root));
    // The demo's own version, not the store's: earlier rounds have saved over the store's.
    let original = Store::at("/nonexistent/tidewright-demo")
        .load_boat(BOAT)
        .unwrap()
        .doc;
    println!("saving");
    for turn in 0u64.. {
        let litres = 1.0 + (turn % 2) as f64;
        store
            .save_boat(BOAT, &with_larger_tank(&original, litres), None, true)
            .unwrap();
    }
}

#[test]
fn a_file_changed_by_another_program_is_not_overwritten_without_asking() {
    let (_dir, store) = demo_store();
    let loaded = store.load_boat(BOAT).unwrap();
    let path = store.boat_path(BOAT).unwrap();
    let edited = with_larger_tank(&loaded.doc, 5.0);
    // Another program rewrites the file with the same content: not a change worth refusing.
    let original = std::fs::read(&path).unwrap();
    std::fs::write(&path, &original).unwrap();
    let saved = store
        .save_boat(BOAT, &edited, loaded.origin.stamp(), false)
        .unwrap();
    // Another program edits it (a comment added by an editor is an edit too).
    let mut theirs = std::fs::read_to_string(&path).unwrap();
    theirs.push_str("# edited elsewhere\n");
    std::fs::write(&path, &theirs).unwrap();
    let mine = with_larger_tank(&loaded.doc, 6.0);
    let error = store
        .save_boat(BOAT, &mine, Some(&saved.stamp), false)
        .unwrap_err();
    assert!(
        matches!(error, ProfileError::ChangedOnDisk { .. }),
        "{error}"
    );
    assert_eq!(std::fs::read_to_string(&path).unwrap(), theirs);
    // Another program deletes it: saving would resurrect a file someone removed, so it asks.
    std::fs::remove_file(&path).unwrap();
    let error = store
        .save_boat(BOAT, &mine, Some(&saved.stamp), false)
        .unwrap_err();
    assert!(
        matches!(error, ProfileError::ChangedOnDisk { .. }),
        "{error}"
    );
    assert!(!path.exists());
    // Asked and confirmed (force), it saves.
    store
        .save_boat(BOAT, &mine, Some(&saved.stamp), true)
        .unwrap();
    assert!(path.exists());
}

#[test]
fn two_store_instances_saving_at_once_never_leave_a_broken_file() {
    let (_dir, store) = demo_store();
    let root = store.root().unwrap().to_owned();
    let path = store.boat_path(BOAT).unwrap();
    let original = store.load_boat(BOAT).unwrap().doc;
    let stop = Arc::new(AtomicBool::new(false));
    // A reader that keeps loading the file while the writers race.
    let reader = {
        let (stop, path) = (Arc::clone(&stop), path.clone());
        std::thread::spawn(move || {
            let mut reads = 0u32;
            while !stop.load(Ordering::Relaxed) {
                let text = std::fs::read_to_string(&path).expect("the file is always there");
                if let Err(e) = BoatDoc::from_toml(&text, "racing.toml") {
                    panic!("a reader saw a broken file: {e}\n{text}");
                }
                reads += 1;
            }
            reads
        })
    };
    const SAVES_PER_WRITER: u32 = 6;
    let writers: Vec<_> = (0..2u32)
        .map(|writer| {
            let root = root.clone();
            let original = original.clone();
            std::thread::spawn(move || {
                let store = Store::at(root);
                let mut refused = 0u32;
                for save in 0..SAVES_PER_WRITER {
                    let litres = f64::from(100 * (writer + 1) + save);
                    let edited = with_larger_tank(&original, litres);
                    // Each writer saves what it loaded; the other's save in between is a
                    // change on disk, refused, and then forced as a user would after asking.
                    let loaded = store.load_boat(BOAT).unwrap();
                    match store.save_boat(BOAT, &edited, loaded.origin.stamp(), false) {
                        Ok(_) => {}
                        Err(ProfileError::ChangedOnDisk { .. }) => {
                            refused += 1;
                            store.save_boat(BOAT, &edited, None, true).unwrap();
                        }
                        Err(other) => panic!("writer {writer}: {other}"),
                    }
                }
                refused
            })
        })
        .collect();
    let refused: u32 = writers.into_iter().map(|w| w.join().unwrap()).sum();
    stop.store(true, Ordering::Relaxed);
    let reads = reader.join().unwrap();
    assert!(reads > 0);
    let last = store.load_boat(BOAT).unwrap().doc;
    let finals: Vec<f64> = (0..2u32)
        .map(|w| with_larger_tank(&original, f64::from(100 * (w + 1) + SAVES_PER_WRITER - 1)))
        .map(|doc| doc.trip.tank.value)
        .collect();
    assert!(
        finals.contains(&last.trip.tank.value),
        "the file holds neither writer's last save: tank {} ({refused} refusals, {reads} reads)",
        last.trip.tank.value
    );
    assert!(temporaries(path.parent().unwrap()).is_empty());
    BoatDoc::from_toml(
        &std::fs::read_to_string(path.with_extension("toml.bak")).unwrap(),
        "backup.toml",
    )
    .expect("the backup parses");
}

#[test]
fn two_writers_adding_to_the_tank_at_once_lose_no_update() {
    // Each writer loads, adds one litre and saves with the stamp it loaded; a change on disk
    // in between is refused and the writer reloads and tries again, as the TUI asks a user
    // to. With the save lock no two saves can both pass the check, so every litre arrives.
    let (_dir, store) = demo_store();
    let root = store.root().unwrap().to_owned();
    let original = store.load_boat(BOAT).unwrap().doc.trip.tank.value;
    const ADDS_PER_WRITER: u32 = 8;
    let writers: Vec<_> = (0..2)
        .map(|_| {
            let root = root.clone();
            std::thread::spawn(move || {
                let store = Store::at(root);
                let mut retries = 0u32;
                for _ in 0..ADDS_PER_WRITER {
                    loop {
                        let loaded = store.load_boat(BOAT).unwrap();
                        let edited = with_larger_tank(&loaded.doc, 1.0);
                        match store.save_boat(BOAT, &edited, loaded.origin.stamp(), false) {
                            Ok(_) => break,
                            Err(ProfileError::ChangedOnDisk { .. }) => retries += 1,
                            Err(other) => panic!("{other}"),
                        }
                    }
                }
                retries
            })
        })
        .collect();
    let retries: u32 = writers.into_iter().map(|w| w.join().unwrap()).sum();
    let last = store.load_boat(BOAT).unwrap().doc.trip.tank.value;
    let added_litres = (last - original) * 1e3;
    assert!(
        (added_litres - f64::from(2 * ADDS_PER_WRITER)).abs() < 0.05,
        "{added_litres:.2} L added of {} ({retries} retries)",
        2 * ADDS_PER_WRITER
    );
    let dir = store.boat_path(BOAT).unwrap().parent().unwrap().to_owned();
    assert!(!dir.join(format!(".{BOAT}.toml.lock")).exists());
}

#[test]
fn a_save_waits_for_a_held_lock_and_takes_over_a_stale_one() {
    let (_dir, store) = demo_store();
    let path = store.boat_path(BOAT).unwrap();
    let lock = path.with_file_name(format!(".{BOAT}.toml.lock"));
    let loaded = store.load_boat(BOAT).unwrap();
    // A lock held by another save (of a live process, this one) that ends 300 ms later: this
    // save waits for it.
    std::fs::write(&lock, format!("{}\n", std::process::id())).unwrap();
    let release = {
        let lock = lock.clone();
        std::thread::spawn(move || {
            std::thread::sleep(Duration::from_millis(300));
            std::fs::remove_file(lock).unwrap();
        })
    };
    let started = Instant::now();
    let edited = with_larger_tank(&loaded.doc, 5.0);
    let saved = store
        .save_boat(BOAT, &edited, loaded.origin.stamp(), false)
        .unwrap();
    assert!(started.elapsed() >= Duration::from_millis(250));
    release.join().unwrap();
    // A lock left by a save that died long ago is taken over at once.
    let file = std::fs::File::create(&lock).unwrap();
    let old = std::time::SystemTime::now()
        - Duration::from_secs(tidewright::profile::store::STALE_LOCK_SECONDS + 5);
    file.set_modified(old).unwrap();
    drop(file);
    let started = Instant::now();
    let edited = with_larger_tank(&edited, 5.0);
    store
        .save_boat(BOAT, &edited, Some(&saved.stamp), false)
        .unwrap();
    assert!(started.elapsed() < Duration::from_secs(1));
    assert!(!lock.exists());
}

/// Creates `name` in `dir` with its modification time `age` in the past.
fn file_aged(dir: &Path, name: &str, age: Duration) -> PathBuf {
    let path = dir.join(name);
    let file = std::fs::File::create(&path).unwrap();
    file.set_modified(std::time::SystemTime::now() - age)
        .unwrap();
    path
}

#[test]
fn a_save_removes_only_its_own_stale_temporaries() {
    let (_dir, store) = demo_store();
    let loaded = store.load_boat(BOAT).unwrap();
    let path = store.boat_path(BOAT).unwrap();
    let boats = path.parent().unwrap();
    let second = Duration::from_secs(1);
    let minute = Duration::from_secs(60);
    let own = format!(".tidewright-{BOAT}.toml-");
    // Removed: this boat's own temporary of a save that died a second ago (older than the
    // lock this save takes), and any temporary of ours a minute old.
    let gone = [
        file_aged(boats, &format!("{own}Ab3dE9.tmp"), second),
        file_aged(boats, ".tidewright-Zq81xY.tmp", minute),
        file_aged(boats, ".tidewright-other.toml-k2LmN0.tmp", minute),
        file_aged(boats, ".recover-7hGt2a.tmp", minute),
    ];
    // Kept: another boat's and a new file's temporaries of a second ago (their saves may be
    // under way, holding locks of their own), and anything not named as ours.
    let kept = [
        file_aged(boats, ".tidewright-other.toml-p9QrS1.tmp", second),
        file_aged(boats, ".tidewright-Yy12zz.tmp", second),
        file_aged(boats, ".tidewright-notes.txt", minute),
        file_aged(boats, &format!("{own}too-long-to-be-random.tmp"), minute),
        file_aged(boats, "my.tmp", minute),
    ];
    store
        .save_boat(
            BOAT,
            &with_larger_tank(&loaded.doc, 5.0),
            loaded.origin.stamp(),
            false,
        )
        .unwrap();
    for path in &gone {
        assert!(!path.exists(), "{path:?} left behind");
    }
    for path in &kept {
        assert!(path.exists(), "{path:?} removed");
    }
}
