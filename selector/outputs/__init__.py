"""What the user reads: terminal tables, file exports, charts, the report and the explorer."""
