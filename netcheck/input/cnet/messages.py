"""The friendly messages of .cnet syntax errors, each with inputs that produce it."""

from __future__ import annotations

__all__ = ["SYNTAX_MESSAGES", "STATE_EXAMPLES", "CHARACTER_HINTS"]

# Friendly messages for syntax errors, each with tiny inputs that produce it.
# The table is also the test of these messages (tests/test_input_errors.py).
SYNTAX_MESSAGES: dict[str, list[str]] = {
    "a component statement needs a reference after its kind (e.g. 'relay K1')": [
        "relay",
        "relay\n",
    ],
    "expected 'key=value' or 'terminal:net'": [
        "relay K1 A1",
        "relay K1 A1 A2:M",
        "relay K1 A1:N3 A2",
        "load Y1 R=10ohm R",
    ],
    "expected a net name after ':'": [
        "relay K1 A1:",
        "relay K1 A1:\n",
        'relay K1 A1:"x"',
    ],
    "expected a value after '='": ["load Y1 R=", "load Y1 R=\n", "load Y1 R=10ohm="],
    "'title', 'parts' and 'include' take one quoted string": [
        "title foo",
        "parts x.yaml",
        'include "a" "b"',
        "title",
        'title "a" b',
        "include",
    ],
    "waive takes a rule, a reference or element, and a quoted reason": [
        "waive",
        "waive rule-x",
        'waive rule-x K1 "r" more',
        "waive rule-x K1:",
    ],
}

# Inputs that only teach the parser's states (their lines are named by
# input/cnet/slips.py before these labels are seen).
STATE_EXAMPLES = {
    "waive takes a rule, a reference or element, and a quoted reason": [
        "waive rule-x K1",
        "waive rule-x K1 reason",
    ],
}

CHARACTER_HINTS = {
    '"': "unterminated or misplaced string (strings are double-quoted on one line)",
    "=": "unexpected '=' (write key=value with no spaces around '=')",
    ":": "unexpected ':' (write terminal:net with no spaces around ':')",
}
