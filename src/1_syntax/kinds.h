// The kinds of waveform and load network the language has: shared by the syntax tree and
// the circuit, without the parser library's headers.
#pragma once

namespace rungs::syntax::ast {

/// `step LOW to HIGH`, `pulse LOW to HIGH`, `dc LEVEL`.
enum class WaveKind { step, pulse, dc };

/// One element, parts in series (`+`) or in parallel (`||`), `open` or `short`.
enum class NetworkKind { single, series, parallel, open, short_circuit };

}  // namespace rungs::syntax::ast
