#!/usr/bin/env node
// Thin launcher: the CLI always runs as compiled JavaScript (see DEVELOPERS.md, "Build").
import "../dist/harness/cli/cli.js";
