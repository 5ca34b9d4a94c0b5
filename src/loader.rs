//! Reads imported model files for the compiler, relative to the importing file and never
//! outside the project root (the nearest folder above the model that holds `.git`, or the
//! model's own folder).

use caloris_compiler::project_files::{project_root, read_import};
use caloris_compiler::source::SourceLoader;
use std::path::{Path, PathBuf};

pub struct FsLoader {
    root: PathBuf,
}

impl FsLoader {
    pub fn for_model(model: &Path) -> FsLoader {
        FsLoader {
            root: project_root(model),
        }
    }
}

impl SourceLoader for FsLoader {
    fn load(&self, from: &str, path: &str) -> Result<(String, String), String> {
        read_import(&self.root, from, path)
    }
}

#[cfg(test)]
mod tests {
    use super::FsLoader;
    use caloris_compiler::{analyze, Analysis, Options};
    use std::path::{Path, PathBuf};

    /// A fresh project folder (with `.git`, so it is the root) inside a fresh scratch folder.
    fn project(tag: &str) -> (PathBuf, PathBuf) {
        let scratch =
            std::env::temp_dir().join(format!("caloris-loader-{tag}-{}", std::process::id()));
        let _ = std::fs::remove_dir_all(&scratch);
        let root = scratch.join("project");
        std::fs::create_dir_all(root.join(".git")).expect("scratch folder");
        (scratch, root)
    }

    fn write(path: &Path, text: &str) {
        std::fs::create_dir_all(path.parent().expect("parent")).expect("folder");
        std::fs::write(path, text).expect("write");
    }

    fn run(model: &Path) -> Analysis {
        let text = std::fs::read_to_string(model).expect("model");
        analyze(
            &model.display().to_string(),
            &text,
            &FsLoader::for_model(model),
            &Options::default(),
        )
    }

    const USES_WOOL: &str = "node a (fixed = 20 °C)\nnode b (fixed = 0 °C)\nlink w: a to b layer(wool, thickness = 100 mm, area = 1 m^2)\n";

    #[test]
    fn paths_are_relative_to_the_importing_file() {
        let (scratch, root) = project("relative");
        // Two files named materials.heat: the one beside the importer must win.
        write(
            &root.join("materials.heat"),
            "material wool (k = 1 W/(m*K))\n",
        );
        write(
            &root.join("rooms/materials.heat"),
            "material wool (k = 0.04 W/(m*K))\n",
        );
        write(&root.join("rooms/lib.heat"), "import \"materials.heat\"\n");
        write(
            &root.join("rooms/model.heat"),
            &format!("import \"lib.heat\"\n{USES_WOOL}"),
        );
        let a = run(&root.join("rooms/model.heat"));
        assert!(!a.has_errors(), "{:?}", a.diagnostics);
        let q = a.solution.expect("solves").heat_flows[0];
        assert!((q - 8.0).abs() < 1e-12, "{q}");
        let _ = std::fs::remove_dir_all(scratch);
    }

    #[test]
    fn nothing_outside_the_project_root_is_read() {
        let (scratch, root) = project("outside");
        write(
            &scratch.join("secret.heat"),
            "material wool (k = 0.04 W/(m*K))\n",
        );
        write(
            &root.join("model.heat"),
            &format!("import \"../secret.heat\"\n{USES_WOOL}"),
        );
        let a = run(&root.join("model.heat"));
        let d = a
            .diagnostics
            .iter()
            .find(|d| d.code == "E601")
            .expect("E601");
        assert!(d.message.contains("outside the project"), "{}", d.message);
        #[cfg(unix)]
        {
            // A link inside the project that points outside is refused as well.
            std::os::unix::fs::symlink(scratch.join("secret.heat"), root.join("alias.heat"))
                .expect("symlink");
            write(
                &root.join("model2.heat"),
                &format!("import \"alias.heat\"\n{USES_WOOL}"),
            );
            let a = run(&root.join("model2.heat"));
            assert!(
                a.diagnostics
                    .iter()
                    .any(|d| d.code == "E601" && d.message.contains("outside the project")),
                "{:?}",
                a.diagnostics
            );
        }
        let _ = std::fs::remove_dir_all(scratch);
    }

    #[test]
    fn import_cycles_are_reported() {
        let (scratch, root) = project("cycle");
        write(
            &root.join("a.heat"),
            "import \"b.heat\"\nmaterial wool (k = 0.04 W/(m*K))\n",
        );
        write(&root.join("b.heat"), "import \"a.heat\"\n");
        write(
            &root.join("model.heat"),
            &format!("import \"a.heat\"\n{USES_WOOL}"),
        );
        let a = run(&root.join("model.heat"));
        let d = a
            .diagnostics
            .iter()
            .find(|d| d.code == "E602")
            .expect("E602");
        assert!(
            d.message.contains("a.heat") && d.message.contains("b.heat"),
            "{}",
            d.message
        );
        let _ = std::fs::remove_dir_all(scratch);
    }

    #[test]
    fn a_missing_file_is_an_error_at_the_import() {
        let (scratch, root) = project("missing");
        write(
            &root.join("model.heat"),
            &format!("import \"nowhere.heat\"\n{USES_WOOL}"),
        );
        let a = run(&root.join("model.heat"));
        assert!(
            a.diagnostics.iter().any(|d| d.code == "E601"),
            "{:?}",
            a.diagnostics
        );
        let _ = std::fs::remove_dir_all(scratch);
    }

    /// A pipe in the project must not be opened: reading one waits for a writer forever.
    #[cfg(unix)]
    #[test]
    fn a_pipe_is_refused_without_waiting() {
        let (scratch, root) = project("pipe");
        let fifo = root.join("pipe.heat");
        let made = std::process::Command::new("mkfifo").arg(&fifo).status();
        if !made.is_ok_and(|s| s.success()) {
            eprintln!("mkfifo is not available; skipped");
            return;
        }
        write(
            &root.join("model.heat"),
            &format!("import \"pipe.heat\"\n{USES_WOOL}"),
        );
        let a = run(&root.join("model.heat"));
        let d = a
            .diagnostics
            .iter()
            .find(|d| d.code == "E601")
            .expect("E601");
        assert!(d.message.contains("not a regular file"), "{}", d.message);
        let _ = std::fs::remove_dir_all(scratch);
    }

    /// A link to its own folder makes endless spellings of one file (`l/a.heat`,
    /// `l/l/a.heat`, ...), and `../project/b.heat` is another spelling of `b.heat`: both end
    /// with an error, as does a chain of imports deeper than the limit.
    #[cfg(unix)]
    #[test]
    fn imports_through_a_folder_loop_end_at_the_depth_limit() {
        let (scratch, root) = project("folder-loop");
        std::os::unix::fs::symlink(".", root.join("l")).expect("symlink");
        write(
            &root.join("a.heat"),
            "import \"l/a.heat\"\nmaterial wool (k = 0.04 W/(m*K))\n",
        );
        write(
            &root.join("model.heat"),
            &format!("import \"a.heat\"\n{USES_WOOL}"),
        );
        let a = run(&root.join("model.heat"));
        // The system refuses a path with too many links (E601) before 64 files nest; either
        // way the chain ends with an error at an import.
        assert!(
            a.diagnostics
                .iter()
                .any(|d| d.code == "E601" || d.code == "E602"),
            "{:?}",
            a.diagnostics
        );

        // Seventy distinct files each importing the next: the depth limit ends the chain.
        for i in 0..70 {
            write(
                &root.join(format!("chain{i}.heat")),
                &format!("import \"chain{}.heat\"\n", i + 1),
            );
        }
        write(
            &root.join("chain70.heat"),
            "material wool (k = 0.04 W/(m*K))\n",
        );
        write(
            &root.join("model3.heat"),
            &format!("import \"chain0.heat\"\n{USES_WOOL}"),
        );
        let a = run(&root.join("model3.heat"));
        assert!(
            a.diagnostics
                .iter()
                .any(|d| d.code == "E602" && d.message.contains("more than 64 files deep")),
            "{:?}",
            a.diagnostics
        );

        write(
            &root.join("b.heat"),
            "import \"../project/b.heat\"\nmaterial wool (k = 0.04 W/(m*K))\n",
        );
        write(
            &root.join("model2.heat"),
            &format!("import \"b.heat\"\n{USES_WOOL}"),
        );
        let a = run(&root.join("model2.heat"));
        assert!(
            a.diagnostics.iter().any(|d| d.code == "E602"),
            "{:?}",
            a.diagnostics
        );
        let _ = std::fs::remove_dir_all(scratch);
    }
}
