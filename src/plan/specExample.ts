/** The commented example `datlas plan --init` writes (YAML; a JSON spec with the same keys works too). */
export const SPEC_EXAMPLE = `# Grid spec for datlas coverage / datlas plan.
# Every planned run is one (condition, label_noise, train_size, width, seed); each should reach
# \`epochs\`. Axes take explicit values or a generator {from, to, count, spacing}.
name: resnet-width-sweep

axes:
  # Model width (channels, hidden units or parameter count). A generator spaces values evenly
  # in log space by default and rounds to integers when both ends are integers.
  width: {from: 4, to: 256, count: 7, spacing: log}   # 4, 8, 16, 32, 64, 128, 256
  # Training-set sizes (explicit list).
  train_size: [1000, 4000, 16000]
  # Fraction of training labels flipped; linear spacing by default. Omit for [0].
  label_noise: [0, 0.1, 0.2]

# Other settings that split the sweep, as the store names them ("adam") or as key: value pairs
# ({optimizer: adam, weight_decay: 0.0005} matches ingest's "optimizer=adam,weight_decay=0.0005").
# Omit when there are none.
conditions: [adam]

# Seeds per cell: a count (ids 0, 1, 2, ...) or an explicit list of seed ids, e.g. [1, 2, 3].
seeds: 3

# Target epochs: a run that stopped earlier counts as partial.
epochs: 4000
`;
