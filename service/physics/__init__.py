"""What a load and a line are at a frequency: load models and line media."""
