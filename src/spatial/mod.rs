//! Volumes, affines, distance transforms, fuzzy landscapes, RCC-8 and region metrics.
