"""Formula text to sympy, through an AST whitelist.

A background file is data: its formulas are parsed with :func:`ast.parse` (which never runs
anything) and the tree is walked node by node, building sympy objects only from a fixed list of
constructs:

- numbers (integers and decimals, turned into exact rationals), the constant ``pi``;
- the coordinate ``z`` and the names the caller declares (parameters, earlier definitions);
- ``+ - * / **`` (``^`` is read as a power, as physicists write it), unary minus;
- calls of the functions in :data:`FUNCTIONS`, positional arguments only.

Everything else (attribute access, subscripts, lambdas, comprehensions, keywords, strings,
dunder names, comparisons...) is refused with a :class:`~holostring.errors.FormulaError` naming the
offending token. No ``eval``, ``exec``, ``sympify`` or ``parse_expr`` ever sees the text.
"""

from __future__ import annotations

import ast
import math
from collections.abc import Mapping

import sympy as sp

from holostring.errors import FormulaError

Z = sp.Symbol("z", positive=True)

#: Allowed functions: name in a file -> (sympy function, number of arguments).
FUNCTIONS: dict[str, tuple[object, int]] = {
    "exp": (sp.exp, 1),
    "log": (sp.log, 1),
    "sqrt": (sp.sqrt, 1),
    "sin": (sp.sin, 1),
    "cos": (sp.cos, 1),
    "tan": (sp.tan, 1),
    "sinh": (sp.sinh, 1),
    "cosh": (sp.cosh, 1),
    "tanh": (sp.tanh, 1),
    "atan": (sp.atan, 1),
    "asinh": (sp.asinh, 1),
    "acosh": (sp.acosh, 1),
    "atanh": (sp.atanh, 1),
    "erf": (sp.erf, 1),
}

CONSTANTS: dict[str, sp.Expr] = {"pi": sp.pi}

MAX_LENGTH = 2000
MAX_NODES = 400
MAX_EXPONENT = 64

_BINOPS = {
    ast.Add: lambda a, b: a + b,
    ast.Sub: lambda a, b: a - b,
    ast.Mult: lambda a, b: a * b,
    ast.Div: lambda a, b: a / b,
}

_DESCRIBE = {
    ast.Attribute: "attribute access is not allowed",
    ast.Subscript: "subscripts are not allowed",
    ast.Lambda: "lambda is not allowed",
    ast.Compare: "comparisons are not allowed",
    ast.BoolOp: "boolean operators are not allowed",
    ast.IfExp: "conditional expressions are not allowed",
    ast.ListComp: "comprehensions are not allowed",
    ast.GeneratorExp: "comprehensions are not allowed",
    ast.DictComp: "comprehensions are not allowed",
    ast.SetComp: "comprehensions are not allowed",
    ast.List: "lists are not allowed",
    ast.Tuple: "tuples are not allowed",
    ast.Dict: "dictionaries are not allowed",
    ast.Set: "sets are not allowed",
    ast.Starred: "starred arguments are not allowed",
    ast.NamedExpr: "assignment expressions are not allowed",
    ast.JoinedStr: "strings are not allowed",
    ast.Await: "await is not allowed",
    ast.Yield: "yield is not allowed",
}


def parse_formula(text: str, symbols: Mapping[str, sp.Expr] | None = None) -> sp.Expr:
    """Parse one formula into a sympy expression in ``z`` and the declared names.

    Parameters
    ----------
    text
        The formula, e.g. ``"exp(c*z^2/2)/z^2"``.
    symbols
        Names the formula may use besides ``z`` and ``pi``: parameter symbols and earlier
        definitions, mapped to the sympy objects they stand for.

    Returns
    -------
    sympy.Expr
        The expression; ``z`` is :data:`Z` (a positive real symbol).

    Raises
    ------
    FormulaError
        For any construct outside the whitelist, an unknown name, a syntax error, a number that
        is not finite or an exponent too large to be sensible. The message names the token.

    Examples
    --------
    >>> import sympy as sp
    >>> c = sp.Symbol("c", positive=True)
    >>> parse_formula("exp(c*z^2/2)/z^2", {"c": c})
    exp(c*z**2/2)/z**2
    """
    if not isinstance(text, str):
        raise FormulaError(f"a formula must be text, not {type(text).__name__}")
    source = text.strip()
    if not source:
        raise FormulaError("the formula is empty")
    if len(source) > MAX_LENGTH:
        raise FormulaError(f"the formula is longer than {MAX_LENGTH} characters")
    if "\n" in source or "\r" in source:
        raise FormulaError("a formula must be a single line")
    # '^' is a power, as physicists write it; it has no other meaning in the grammar, so the
    # textual swap is exact (and gives it the precedence of '**').
    source = source.replace("^", "**")
    try:
        tree = ast.parse(source, mode="eval")
    except SyntaxError as err:
        token = _token_at(source, err.offset)
        raise FormulaError("syntax error", token) from None
    except (ValueError, RecursionError, MemoryError):
        raise FormulaError("the formula cannot be parsed") from None
    count = sum(1 for _ in ast.walk(tree))
    if count > MAX_NODES:
        raise FormulaError(f"the formula has more than {MAX_NODES} parts")
    names = dict(CONSTANTS)
    names["z"] = Z
    if symbols:
        names.update(symbols)
    return _Builder(source, names).build(tree.body)


def _token_at(source: str, offset: int | None) -> str:
    if not offset:
        return source[:20]
    i = max(offset - 1, 0)
    return source[i : i + 12] or source[-12:]


class _Builder:
    def __init__(self, source: str, names: Mapping[str, sp.Expr]) -> None:
        self.source = source
        self.names = names

    def token(self, node: ast.AST) -> str:
        segment = ast.get_source_segment(self.source, node)
        return (segment or type(node).__name__)[:40]

    def build(self, node: ast.AST) -> sp.Expr:
        if isinstance(node, ast.Constant):
            return self.constant(node)
        if isinstance(node, ast.Name):
            return self.name(node)
        if isinstance(node, ast.UnaryOp):
            if isinstance(node.op, ast.USub):
                return -self.build(node.operand)
            if isinstance(node.op, ast.UAdd):
                return self.build(node.operand)
            raise FormulaError("only unary + and - are allowed", self.token(node))
        if isinstance(node, ast.BinOp):
            return self.binop(node)
        if isinstance(node, ast.Call):
            return self.call(node)
        reason = _DESCRIBE.get(type(node), f"'{type(node).__name__}' is not allowed in a formula")
        raise FormulaError(reason, self.token(node))

    def constant(self, node: ast.Constant) -> sp.Expr:
        value = node.value
        if isinstance(value, bool) or not isinstance(value, int | float):
            raise FormulaError("only numbers are allowed as constants", self.token(node))
        if isinstance(value, float):
            if not math.isfinite(value):
                raise FormulaError("number is not finite", self.token(node))
            return sp.Rational(repr(value))
        if abs(value) > 10**30:
            raise FormulaError("integer constant too large", self.token(node))
        return sp.Integer(value)

    def name(self, node: ast.Name) -> sp.Expr:
        ident = node.id
        if ident.startswith("__") or ident.endswith("__"):
            raise FormulaError("dunder names are not allowed", ident)
        if ident in FUNCTIONS:
            raise FormulaError(f"function '{ident}' must be called with an argument", ident)
        if ident not in self.names:
            raise FormulaError(f"undeclared symbol '{ident}'", ident)
        return self.names[ident]

    def binop(self, node: ast.BinOp) -> sp.Expr:
        if isinstance(node.op, ast.Pow):
            base = self.build(node.left)
            exponent = self.build(node.right)
            if exponent.is_number:
                try:
                    too_big = abs(float(exponent)) > MAX_EXPONENT
                except (TypeError, ValueError):
                    too_big = True
                if too_big:
                    raise FormulaError(f"exponent larger than {MAX_EXPONENT} in size", self.token(node.right))
            return sp.Pow(base, exponent)
        op = _BINOPS.get(type(node.op))
        if op is None:
            raise FormulaError(f"operator '{type(node.op).__name__}' is not allowed", self.token(node))
        left = self.build(node.left)
        right = self.build(node.right)
        if isinstance(node.op, ast.Div) and right == 0:
            raise FormulaError("division by zero", self.token(node))
        return op(left, right)

    def call(self, node: ast.Call) -> sp.Expr:
        if not isinstance(node.func, ast.Name):
            if isinstance(node.func, ast.Attribute):
                raise FormulaError("attribute access is not allowed", self.token(node.func))
            raise FormulaError("only named functions may be called", self.token(node.func))
        ident = node.func.id
        if ident.startswith("__"):
            raise FormulaError("dunder names are not allowed", ident)
        if ident not in FUNCTIONS:
            allowed = ", ".join(sorted(FUNCTIONS))
            raise FormulaError(f"unknown function '{ident}' (allowed: {allowed})", ident)
        if node.keywords:
            raise FormulaError("keyword arguments are not allowed", self.token(node))
        func, arity = FUNCTIONS[ident]
        if len(node.args) != arity:
            raise FormulaError(f"'{ident}' takes {arity} argument(s)", self.token(node))
        args = [self.build(arg) for arg in node.args]
        return func(*args)  # type: ignore[operator]
