"""The physics: cross-sections and load cases, written as power laws where they are."""
