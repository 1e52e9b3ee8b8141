// signal/ declares the untyped `fili` module in its own tree; the server compiles signal's sources
// through @pendula/signal, so it needs that ambient declaration too.
/// <reference path="../../../signal/src/filter/fili.d.ts" />
