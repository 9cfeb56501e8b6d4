//! Never lose data: `aggrade convert` saves a project over an existing file again and again and
//! is killed with SIGKILL after a random delay; after every kill the file on disk must be a
//! complete copy of one of the versions written (byte for byte), and it must load and validate.

use aggrade_core::io::{load, project_to_json};
use aggrade_core::model::{BedId, Project};
use std::path::{Path, PathBuf};
use std::process::Command;
use std::time::Instant;

/// Kills made in the normal suite. Each costs one start of the debug binary (about half a second
/// on a busy machine), so the long run is opt-in: `AGGRADE_KILL_ITERATIONS=200`.
const DEFAULT_ITERATIONS: usize = 40;
/// Beds per version: enough that writing and syncing the file is a real share of the run time.
const BEDS: usize = 1_500;

/// Small deterministic generator (xorshift64*), so a failing run can be repeated from its seed.
struct Rng(u64);
impl Rng {
    fn next(&mut self) -> u64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        self.0.wrapping_mul(0x2545_F491_4F6C_DD1D)
    }
    /// Uniform in [0, 1).
    fn unit(&mut self) -> f64 {
        (self.next() >> 11) as f64 / (1u64 << 53) as f64
    }
}

fn demo() -> Project {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../sample_sections/demo.aggrade");
    load(&path).unwrap_or_else(|e| panic!("demo project does not load: {e}")).project
}

/// A one-section project of `BEDS` beds cycled from the demo's first section, with every
/// thickness scaled so that two versions differ in every bed.
fn version(demo: &Project, scale: f64) -> Project {
    let mut section = demo.sections[0].clone();
    let pattern = section.beds.clone();
    section.beds = (0..BEDS)
        .map(|i| {
            let mut bed = pattern[i % pattern.len()].clone();
            bed.id = BedId(i as u64 + 1);
            bed.thickness_m = (bed.thickness_m * scale * 1000.0).round() / 1000.0;
            // Surface names must stay unique within a section.
            if let Some(s) = &mut bed.base_surface {
                s.name = format!("{}-{i}", s.name);
            }
            bed
        })
        .collect();
    // Review decisions point at beds of the original section; none are needed here.
    section.review.clear();
    Project::new(vec![section])
}

fn write(path: &Path, text: &str) {
    std::fs::write(path, text).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
}

fn convert(input: &Path, output: &Path) -> Command {
    let mut cmd = Command::new(env!("CARGO_BIN_EXE_aggrade"));
    cmd.arg("convert").arg(input).arg(output).stderr(std::process::Stdio::null());
    cmd
}

#[test]
fn file_is_always_a_complete_old_or_new_version_after_sigkill_during_saves() {
    let dir = tempfile::tempdir().expect("temporary folder");
    let demo = demo();
    let inputs = [dir.path().join("a.aggrade"), dir.path().join("b.aggrade")];
    let mut expected = Vec::new();
    for (input, scale) in inputs.iter().zip([1.0, 1.5]) {
        let text = project_to_json(&version(&demo, scale)).expect("encodes");
        write(input, &text);
        // What convert writes is the reader's view of the input, encoded by the same writer.
        let reread = load(input).unwrap_or_else(|e| panic!("generated input does not load: {e}")).project;
        expected.push(project_to_json(&reread).expect("encodes"));
    }
    assert_ne!(expected[0], expected[1], "the two versions must differ");

    // Complete saves, untouched, give the file an old version and the run time to aim at: the
    // fastest of three, since the first run (cold binary) or a busy moment would stretch the
    // delays past most saves.
    let output = dir.path().join("saved.aggrade");
    let mut full_run = std::time::Duration::MAX;
    for _ in 0..3 {
        let start = Instant::now();
        let status = convert(&inputs[0], &output).status().expect("aggrade runs");
        full_run = full_run.min(start.elapsed());
        assert!(status.success(), "a complete save failed");
    }

    let iterations = match std::env::var("AGGRADE_KILL_ITERATIONS") {
        Ok(v) => {
            v.parse::<usize>().unwrap_or_else(|_| panic!("AGGRADE_KILL_ITERATIONS={v:?} is not a count"))
        }
        Err(_) => DEFAULT_ITERATIONS,
    };
    let seed = 0x5EED_A66D_u64;
    let mut rng = Rng(seed);
    let temp = dir.path().join(".saved.aggrade.tmp");
    let backup = dir.path().join("saved.aggrade.bak");
    let (mut killed_running, mut killed_with_temp_file, mut finished) = (0, 0, 0);
    let mut backup_seen = false;
    for i in 0..iterations {
        let input = &inputs[i % 2];
        // Kill anywhere from the start up to a little past a full run.
        let delay = full_run.mul_f64(1.2 * rng.unit());
        let mut child = convert(input, &output).spawn().expect("aggrade starts");
        std::thread::sleep(delay);
        match child.try_wait().expect("child state") {
            Some(_) => finished += 1,
            None => {
                killed_running += 1;
                child.kill().expect("SIGKILL");
            }
        }
        child.wait().expect("child reaped");
        if temp.exists() {
            killed_with_temp_file += 1;
        }
        for path in [&output, &backup] {
            if !path.exists() {
                // The backup appears with the first save that replaces the file, and then stays.
                assert!(
                    path == &backup && !backup_seen,
                    "iteration {i} (seed {seed:#x}): {} is gone",
                    path.display()
                );
                continue;
            }
            backup_seen |= path == &backup;
            let on_disk = std::fs::read_to_string(path)
                .unwrap_or_else(|e| panic!("iteration {i}: {}: {e}", path.display()));
            assert!(
                expected.contains(&on_disk),
                "iteration {i} (seed {seed:#x}, delay {delay:?}): {} is neither version ({} bytes)",
                path.display(),
                on_disk.len()
            );
        }
        if let Err(e) = load(&output) {
            panic!("iteration {i}: the saved file does not load: {e}");
        }
    }
    eprintln!(
        "{iterations} saves of {BEDS} beds (full run {full_run:?}): {killed_running} killed while running \
         ({killed_with_temp_file} left a half-written temporary file), {finished} finished first"
    );
    // The test proves something only if kills really landed inside saves.
    assert!(
        killed_running >= iterations / 4,
        "only {killed_running} of {iterations} kills hit a running save"
    );
}
