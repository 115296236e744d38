//! The ligand catalogue: bundled sets compiled into the binary, user sets merged over them,
//! token look-up for the formula parser, and fuzzy search.

mod load;
mod search;

use std::collections::HashMap;
use std::hash::{BuildHasherDefault, Hasher};
use std::path::{Path, PathBuf};
use std::sync::{Arc, OnceLock};

use fuzzy_matcher::skim::SkimMatcherV2;

use crate::chem::formula::LigandLookup;
use crate::chem::ligand::LigandDef;
use crate::chem::molecule::{Composition, Molecule};
use crate::chem::species::SubstrateDef;

pub use load::{parse_set, SetError, FAMILIES};
pub use search::Hit;

// BUNDLED: the ligand sets compiled in by build.rs
include!(concat!(env!("OUT_DIR"), "/bundled_sets.rs"));

/// All known ligands, indexed for the parser and for search.
pub struct Catalogue {
    ligands: Vec<Arc<LigandDef>>,
    /// Formula token (key, formula, alias without spaces) -> ligand index.
    tokens: HashMap<String, usize, BuildHasherDefault<Fnv>>,
    /// First byte of a token -> (token, ligand index) for tokens of two or more bytes, sorted
    /// by second byte and then longest first.
    by_first: Vec<Vec<(String, usize)>>,
    /// One-byte tokens ("H", "C", "O") by their byte.
    single: Vec<Option<usize>>,
    /// Problems found while loading: bad files, bad entries, clashing tokens.
    pub warnings: Vec<SetError>,
    matcher: SkimMatcherV2,
    /// Lower-case search text per ligand (see `search::haystack`).
    haystacks: Vec<String>,
    substrates: Vec<Arc<SubstrateDef>>,
    /// Substrate key or alias (without spaces) -> substrate index.
    substrate_tokens: HashMap<String, usize>,
    /// Composition and number of metal bonds -> ligands and substrates with them.
    by_formula: HashMap<(Composition, usize), Vec<Entry>>,
    /// Canonical SMILES of each ligand and substrate, worked out when first compared.
    canon_ligands: Vec<OnceLock<String>>,
    canon_substrates: Vec<OnceLock<String>>,
    /// Built when a token is first unknown (see `search::suggest`).
    suggest_index: OnceLock<search::SuggestIndex>,
}

#[derive(Debug, Clone, Copy)]
enum Entry {
    Ligand(usize),
    Substrate(usize),
}

fn formula_key(m: &Molecule) -> (Composition, usize) {
    (m.composition(), m.star_count())
}

impl Catalogue {
    /// The bundled sets only.
    pub fn bundled() -> Catalogue {
        Catalogue::from_sets(bundled_texts(), Vec::new())
    }

    /// The bundled sets with every `*.toml` in `user_dir` merged over them (same key replaces).
    pub fn with_user_dir(user_dir: Option<&Path>) -> Catalogue {
        let mut user = Vec::new();
        let mut io_errors = Vec::new();
        if let Some(dir) = user_dir {
            match std::fs::read_dir(dir) {
                Ok(rd) => {
                    let mut paths: Vec<PathBuf> = rd
                        .filter_map(Result::ok)
                        .map(|e| e.path())
                        .filter(|p| p.extension().is_some_and(|x| x == "toml"))
                        .collect();
                    paths.sort();
                    for p in paths {
                        let name = p.display().to_string();
                        match read_set_file(&p) {
                            Ok(text) => user.push((name, text)),
                            Err(message) => io_errors.push(SetError {
                                file: name,
                                line: 0,
                                column: 0,
                                key: None,
                                message,
                            }),
                        }
                    }
                }
                Err(e) if e.kind() == std::io::ErrorKind::NotFound => {}
                Err(e) => io_errors.push(SetError {
                    file: dir.display().to_string(),
                    line: 0,
                    column: 0,
                    key: None,
                    message: format!("cannot list user ligand sets: {e}"),
                }),
            }
        }
        let mut c = Catalogue::from_sets(bundled_texts(), user);
        c.warnings.extend(io_errors);
        c
    }

    /// Build from (name, text) pairs: bundled first, then user sets.
    pub fn from_sets(bundled: Vec<(String, String)>, user: Vec<(String, String)>) -> Catalogue {
        let mut warnings = Vec::new();
        let mut ligands: Vec<LigandDef> = Vec::new();
        let mut substrates: Vec<SubstrateDef> = Vec::new();
        // key -> position, so merging stays linear in the number of entries
        let mut ligand_index: HashMap<String, usize> = HashMap::new();
        let mut substrate_index: HashMap<String, usize> = HashMap::new();
        for (is_user, (name, text)) in bundled
            .into_iter()
            .map(|s| (false, s))
            .chain(user.into_iter().map(|s| (true, s)))
        {
            let origin = if is_user {
                name.clone()
            } else {
                format!("bundled:{}", name.trim_end_matches(".toml"))
            };
            let set = load::parse_set_all(&name, &text, &origin);
            warnings.extend(set.errors);
            for d in set.substrates {
                match substrate_index.get(&d.key) {
                    Some(&i) if is_user => substrates[i] = d,
                    Some(_) => warnings.push(SetError {
                        file: name.clone(),
                        line: 0,
                        column: 0,
                        key: Some(d.key.clone()),
                        message:
                            "substrate key defined twice in the bundled sets; the first is kept"
                                .into(),
                    }),
                    None => {
                        substrate_index.insert(d.key.clone(), substrates.len());
                        substrates.push(d);
                    }
                }
            }
            for d in set.ligands {
                match ligand_index.get(&d.key) {
                    Some(&i) if is_user => ligands[i] = d,
                    Some(_) => warnings.push(SetError {
                        file: name.clone(),
                        line: 0,
                        column: 0,
                        key: Some(d.key.clone()),
                        message: "key defined twice in the bundled sets; the first is kept".into(),
                    }),
                    None => {
                        ligand_index.insert(d.key.clone(), ligands.len());
                        ligands.push(d);
                    }
                }
            }
        }
        for l in &ligands {
            if let Some(other) = &l.counterpart {
                if !ligand_index.contains_key(other) {
                    warnings.push(SetError {
                        file: l.origin.clone(),
                        line: 0,
                        column: 0,
                        key: Some(l.key.clone()),
                        message: format!(
                            "counterpart '{other}' is not a ligand key; the note on the other \
                             form is left out"
                        ),
                    });
                }
            }
        }
        let ligands: Vec<Arc<LigandDef>> = ligands.into_iter().map(Arc::new).collect();
        let mut tokens: HashMap<String, usize, BuildHasherDefault<Fnv>> = HashMap::default();
        for (i, l) in ligands.iter().enumerate() {
            for t in formula_tokens(l) {
                match tokens.get(t) {
                    Some(&j) if j != i => warnings.push(SetError {
                        file: l.origin.clone(),
                        line: 0,
                        column: 0,
                        key: Some(l.key.clone()),
                        message: format!(
                            "'{t}' already names ligand '{}'; it keeps that meaning",
                            ligands[j].key
                        ),
                    }),
                    Some(_) => {}
                    None => {
                        tokens.insert(t.to_string(), i);
                    }
                }
            }
        }
        let mut by_first: Vec<Vec<(String, usize)>> = vec![Vec::new(); 256];
        let mut single: Vec<Option<usize>> = vec![None; 256];
        for (t, &i) in &tokens {
            match t.as_bytes() {
                [b] => single[*b as usize] = Some(i),
                [b, ..] => by_first[*b as usize].push((t.clone(), i)),
                [] => {}
            }
        }
        for list in &mut by_first {
            list.sort_by(|a, b| {
                a.0.as_bytes()[1]
                    .cmp(&b.0.as_bytes()[1])
                    .then(b.0.len().cmp(&a.0.len()))
                    .then(a.0.cmp(&b.0))
            });
        }
        let haystacks = ligands.iter().map(|l| search::haystack(l)).collect();
        let substrates: Vec<Arc<SubstrateDef>> = substrates.into_iter().map(Arc::new).collect();
        let mut substrate_tokens = HashMap::new();
        for (i, d) in substrates.iter().enumerate() {
            for t in std::iter::once(&d.key)
                .chain(&d.aliases)
                .chain([&d.formula])
            {
                if !t.chars().any(char::is_whitespace) {
                    substrate_tokens.entry(t.clone()).or_insert(i);
                }
            }
        }
        let mut by_formula: HashMap<(Composition, usize), Vec<Entry>> = HashMap::new();
        for (i, l) in ligands.iter().enumerate() {
            if let Some(m) = &l.structure {
                by_formula
                    .entry(formula_key(m))
                    .or_default()
                    .push(Entry::Ligand(i));
            }
        }
        for (i, d) in substrates.iter().enumerate() {
            by_formula
                .entry(formula_key(&d.structure))
                .or_default()
                .push(Entry::Substrate(i));
        }
        Catalogue {
            canon_ligands: (0..ligands.len()).map(|_| OnceLock::new()).collect(),
            canon_substrates: (0..substrates.len()).map(|_| OnceLock::new()).collect(),
            suggest_index: OnceLock::new(),
            ligands,
            tokens,
            by_first,
            single,
            warnings,
            matcher: SkimMatcherV2::default(),
            haystacks,
            substrates,
            substrate_tokens,
            by_formula,
        }
    }

    fn suggest_index(&self) -> &search::SuggestIndex {
        self.suggest_index
            .get_or_init(|| search::SuggestIndex::new(self))
    }

    pub fn substrates(&self) -> &[Arc<SubstrateDef>] {
        &self.substrates
    }

    /// Catalogue entries with the structure of `m` (same constitution, same metal bonds).
    fn same_structure(&self, m: &Molecule) -> Vec<Entry> {
        let candidates = self
            .by_formula
            .get(&formula_key(m))
            .map_or(&[][..], Vec::as_slice);
        if candidates.is_empty() {
            return Vec::new();
        }
        let want = m.canonical_smiles();
        candidates
            .iter()
            .copied()
            .filter(|e| {
                let have = match *e {
                    Entry::Ligand(i) => self.canon_ligands[i].get_or_init(|| {
                        self.ligands[i]
                            .structure
                            .as_ref()
                            .map_or(String::new(), |s| s.canonical_smiles())
                    }),
                    Entry::Substrate(i) => self.canon_substrates[i]
                        .get_or_init(|| self.substrates[i].structure.canonical_smiles()),
                };
                *have == want
            })
            .collect()
    }

    pub fn ligands(&self) -> &[Arc<LigandDef>] {
        &self.ligands
    }

    pub fn len(&self) -> usize {
        self.ligands.len()
    }

    pub fn is_empty(&self) -> bool {
        self.ligands.is_empty()
    }

    pub fn get(&self, key: &str) -> Option<&Arc<LigandDef>> {
        self.tokens.get(key).map(|&i| &self.ligands[i])
    }
}

/// FNV-1a: formula tokens are a few bytes long, where it beats the default SipHash by far and
/// needs no protection against crafted keys (the keys come from ligand sets).
#[derive(Default)]
pub struct Fnv(u64);

impl Hasher for Fnv {
    fn finish(&self) -> u64 {
        self.0
    }

    fn write(&mut self, bytes: &[u8]) {
        let mut h = if self.0 == 0 {
            0xcbf2_9ce4_8422_2325
        } else {
            self.0
        };
        for &b in bytes {
            h ^= b as u64;
            h = h.wrapping_mul(0x0100_0000_01b3);
        }
        self.0 = h;
    }
}

fn bundled_texts() -> Vec<(String, String)> {
    BUNDLED
        .iter()
        .map(|(n, t)| (n.to_string(), t.to_string()))
        .collect()
}

/// The strings that name a ligand inside a formula: key, formula and aliases without spaces.
fn formula_tokens(l: &LigandDef) -> impl Iterator<Item = &str> {
    std::iter::once(l.key.as_str())
        .chain(std::iter::once(l.formula.as_str()))
        .chain(l.aliases.iter().map(String::as_str))
        .filter(|t| !t.is_empty() && !t.chars().any(char::is_whitespace))
}

impl LigandLookup for Catalogue {
    fn exact(&self, token: &str) -> Option<&Arc<LigandDef>> {
        self.get(token)
    }

    fn longest_prefix(
        &self,
        text: &str,
        accept: &dyn Fn(usize) -> bool,
    ) -> Option<(&Arc<LigandDef>, usize)> {
        let bytes = text.as_bytes();
        let first = *bytes.first()? as usize;
        if let Some(&second) = bytes.get(1) {
            let list = &self.by_first[first];
            // the run of tokens with this second byte, longest first
            let from = list.partition_point(|(t, _)| t.as_bytes()[1] < second);
            let hit = list[from..]
                .iter()
                .take_while(|(t, _)| t.as_bytes()[1] == second)
                .find(|(t, _)| text.starts_with(t.as_str()) && accept(t.len()));
            if let Some((t, i)) = hit {
                return Some((&self.ligands[*i], t.len()));
            }
        }
        self.single[first]
            .filter(|_| accept(1))
            .map(|i| (&self.ligands[i], 1))
    }

    fn suggest(&self, token: &str) -> Option<String> {
        search::suggest(self, token)
    }

    fn substrate(&self, token: &str) -> Option<&Arc<SubstrateDef>> {
        self.substrate_tokens
            .get(token)
            .map(|&i| &self.substrates[i])
    }

    fn ligand_like(&self, m: &Molecule) -> Option<&Arc<LigandDef>> {
        self.same_structure(m).into_iter().find_map(|e| match e {
            Entry::Ligand(i) => Some(&self.ligands[i]),
            Entry::Substrate(_) => None,
        })
    }

    fn substrate_like(&self, m: &Molecule) -> Option<&Arc<SubstrateDef>> {
        self.same_structure(m).into_iter().find_map(|e| match e {
            Entry::Substrate(i) => Some(&self.substrates[i]),
            Entry::Ligand(_) => None,
        })
    }
}

/// Largest user ligand set read, bytes: about 100,000 ligands.
pub const MAX_SET_BYTES: u64 = 16 << 20;

/// The text of a user ligand set. Only regular files are read (a FIFO would block every
/// command, a device might never end), at most `MAX_SET_BYTES` of them, as UTF-8. The error
/// says what is wrong and what to do; the file is then skipped.
pub fn read_set_file(path: &Path) -> Result<String, String> {
    use std::io::Read;
    let meta = std::fs::metadata(path).map_err(|e| format!("cannot read: {e}"))?;
    if !meta.file_type().is_file() {
        return Err(not_regular(&meta));
    }
    let too_big = |size: u64| {
        format!(
            "the file is {:.1} MiB; a ligand set may be at most {} MiB: split it into several \
             files",
            size as f64 / (1u64 << 20) as f64,
            MAX_SET_BYTES >> 20
        )
    };
    if meta.len() > MAX_SET_BYTES {
        return Err(too_big(meta.len()));
    }
    let file = open_nonblocking(path).map_err(|e| format!("cannot read: {e}"))?;
    // the path may have been swapped for something else since it was looked at
    let opened = file.metadata().map_err(|e| format!("cannot read: {e}"))?;
    if !opened.file_type().is_file() {
        return Err(not_regular(&opened));
    }
    let mut bytes = Vec::with_capacity(opened.len().min(MAX_SET_BYTES) as usize);
    file.take(MAX_SET_BYTES + 1)
        .read_to_end(&mut bytes)
        .map_err(|e| format!("cannot read: {e}"))?;
    if bytes.len() as u64 > MAX_SET_BYTES {
        return Err(too_big(bytes.len() as u64));
    }
    String::from_utf8(bytes).map_err(|e| {
        let good = &e.as_bytes()[..e.utf8_error().valid_up_to()];
        let line = good.iter().filter(|&&b| b == b'\n').count() + 1;
        format!("line {line} is not UTF-8 text; save the file as UTF-8")
    })
}

fn open_nonblocking(path: &Path) -> std::io::Result<std::fs::File> {
    let mut options = std::fs::OpenOptions::new();
    options.read(true);
    #[cfg(unix)]
    {
        use std::os::unix::fs::OpenOptionsExt;
        options.custom_flags(libc::O_NONBLOCK);
    }
    options.open(path)
}

/// Why a path is not read: what it is instead of a regular file.
fn not_regular(meta: &std::fs::Metadata) -> String {
    format!(
        "{}, skipped: ligand sets are read only from regular files; move it out of the \
         ligand_sets directory or rename it without .toml",
        file_kind(meta.file_type())
    )
}

fn file_kind(t: std::fs::FileType) -> &'static str {
    #[cfg(unix)]
    {
        use std::os::unix::fs::FileTypeExt;
        if t.is_fifo() {
            return "a FIFO (named pipe)";
        }
        if t.is_socket() {
            return "a socket";
        }
        if t.is_char_device() || t.is_block_device() {
            return "a device";
        }
    }
    if t.is_dir() {
        "a directory"
    } else {
        "not a regular file"
    }
}

/// Where user ligand sets are read from: `$NONET_CONFIG_DIR/ligand_sets`, else the platform
/// config directory (XDG on Linux).
pub fn user_set_dir() -> Option<PathBuf> {
    config_dir().map(|d| d.join("ligand_sets"))
}

/// The config directory: `NONET_CONFIG_DIR` if set and non-empty, else the platform's.
pub fn config_dir() -> Option<PathBuf> {
    match std::env::var_os("NONET_CONFIG_DIR") {
        Some(v) if !v.is_empty() => Some(PathBuf::from(v)),
        _ => directories::ProjectDirs::from("", "", "nonet").map(|p| p.config_dir().to_path_buf()),
    }
}
