"""The steps in order: screen, derive, size, rank, trade-offs, robustness; `select` runs them."""
