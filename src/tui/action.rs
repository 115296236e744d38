//! What the user can ask for; keys map to these through the keymap table.

/// A request from the keyboard.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Action {
    Up,
    Down,
    PageUp,
    PageDown,
    FocusLeft,
    FocusRight,
    FocusNext,
    /// Commit what the preview shows.
    Commit,
    StartSearch,
    /// Preview binding the selected catalogue ligand at an open site.
    PendAdd,
    /// Preview taking the selected ligand off.
    PendRemove,
    /// Preview the next binding mode of the selected ligand.
    PendMode,
    PendOxidize,
    PendReduce,
    /// Back to previewing a swap.
    Cancel,
    StartFormula,
    SubmitFormula,
    Undo,
    Redo,
    CycleFamily,
    CycleClass,
    ClearFilters,
    Help,
    CloseHelp,
    Repaint,
    Quit,
    /// A character typed into the search or formula line.
    Input(char),
    DeleteChar,
    ClearInput,
    /// Leave the search or formula line.
    LeaveInput,
    /// Elementary steps on the selected ligand (previewed first).
    StepOxidativeAddition,
    StepReductiveElimination,
    StepInsertion,
    StepBetaElimination,
    StepAlphaElimination,
    StepProtonation,
    StepDeprotonation,
    StepDissociation,
    StepAssociation,
    StepTransmetalation,
    StepAbstraction,
    StepNucleophilic,
    StepElectrophilic,
    StepSigmaBond,
    StepProtonolysis,
    StepMetalation,
    StepCycloaddition,
    StepCycloreversion,
    StepCoupling,
    /// Type any step as the CLI writes it.
    StepTyped,
    StepIsomerization,
    /// The next partner, alkene or regiochemistry of the step in the preview.
    NextChoice,
    /// The current path drawn as a cycle.
    OpenCycle,
    /// The session's tree of variants.
    OpenTree,
    JumpToVariant,
    StartBookmark,
    CompareVariant,
    /// Write the session out as Markdown.
    Export,
    /// Rank every catalogue ligand in place of the selected one.
    OpenScreen,
    /// Screening constraints, each a toggle or a cycle.
    ScreenElectrons,
    ScreenSaturated,
    ScreenCrowding,
    ScreenDiamagnetic,
    ScreenNoHazards,
    ScreenRank,
    /// Take the highlighted candidate to the swap preview.
    ScreenPick,
}
