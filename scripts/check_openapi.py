"""Checks the committed OpenAPI document the way a client developer meets it.

Run by scripts/check-openapi with the Python of scripts/venv (which pins
openapi-spec-validator and openapi-python-client). Four checks, each failing
the run:

1. the document validates against the OpenAPI 3.1 schema
   (openapi-spec-validator);
2. every `$ref` is local and resolves (own walker: the validator stops at
   the first dangling one it happens to follow);
3. no `allOf` is unsatisfiable in the two ways found in this document
   before: a property declared by two branches with types that share no
   value, or a branch closed with `additionalProperties: false` while
   another branch requires or declares a property the closed branch does
   not list (required: no value fits; declared: it can never be sent);
4. openapi-python-client generates a client without a warning, and every
   operation (method + path) of the document has a generated endpoint
   module with its request functions.

Before all that the walker checks itself on broken copies of the document,
so checks 2 and 3 are known to fail when they should.
"""

import copy
import json
import pathlib
import re
import subprocess
import sys

METHODS = ("get", "put", "post", "delete", "patch", "head", "options", "trace")


def fail(message):
    print(f"scripts/check-openapi: {message}", file=sys.stderr)
    sys.exit(1)


def pointer(doc, ref):
    """The node a local `#/...` reference names, or None."""
    if not ref.startswith("#/"):
        return None
    node = doc
    for part in ref[2:].split("/"):
        part = part.replace("~1", "/").replace("~0", "~")
        if isinstance(node, dict) and part in node:
            node = node[part]
        elif isinstance(node, list) and part.isdigit() and int(part) < len(node):
            node = node[int(part)]
        else:
            return None
    return node


def walk(node, where="#"):
    """Yields (location, dict) for every object in the document."""
    if isinstance(node, dict):
        yield where, node
        for key, value in node.items():
            yield from walk(value, f"{where}/{key}")
    elif isinstance(node, list):
        for i, value in enumerate(node):
            yield from walk(value, f"{where}/{i}")


def dangling_refs(doc):
    """(count of $refs, list of problems)."""
    problems = []
    count = 0
    for where, obj in walk(doc):
        ref = obj.get("$ref")
        if not isinstance(ref, str):
            continue
        count += 1
        if not ref.startswith("#/"):
            problems.append(f"{where}: $ref {ref} is not local to the document")
        elif pointer(doc, ref) is None:
            problems.append(f"{where}: $ref {ref} does not resolve")
    return count, problems


def deref(doc, schema, depth=0):
    while isinstance(schema, dict) and "$ref" in schema and depth < 50:
        schema = pointer(doc, schema["$ref"]) or {}
        depth += 1
    return schema if isinstance(schema, dict) else {}


def branch_shape(doc, schema, depth=0):
    """Properties, required names and closedness of one allOf branch,
    following `$ref`s and nested `allOf`s."""
    schema = deref(doc, schema)
    props, required, closed = {}, set(), []
    if depth < 20:
        for inner in schema.get("allOf", []):
            p, r, c = branch_shape(doc, inner, depth + 1)
            for name, s in p.items():
                props.setdefault(name, []).extend(s)
            required |= r
            closed.extend(c)
    for name, s in schema.get("properties", {}).items():
        props.setdefault(name, []).append(s)
    required |= set(schema.get("required", []))
    if schema.get("additionalProperties") is False:
        closed.append(set(schema.get("properties", {})))
    return props, required, closed


def types_of(doc, schema):
    """The JSON types a property schema admits, or None when it does not
    say plainly (no `type`, e.g. a oneOf)."""
    schema = deref(doc, schema)
    declared = schema.get("type")
    if declared is None:
        return None
    declared = {declared} if isinstance(declared, str) else set(declared)
    if "number" in declared:
        declared.add("integer")
    return declared


def unsatisfiable_all_ofs(doc):
    problems = []
    for where, obj in walk(doc):
        branches = obj.get("allOf")
        if not isinstance(branches, list) or len(branches) < 2:
            continue
        shapes = [branch_shape(doc, b) for b in branches]
        names = set().union(*(set(p) for p, _, _ in shapes))
        for name in sorted(names):
            sets = [types_of(doc, s) for p, _, _ in shapes for s in p.get(name, [])]
            sets = [s for s in sets if s is not None]
            if len(sets) > 1 and not set.intersection(*sets):
                kinds = " vs ".join("/".join(sorted(s - {"integer"} or s)) for s in sets)
                problems.append(f"{where}/allOf: property `{name}` is {kinds}: no value fits all")
        for i, (_, _, closed) in enumerate(shapes):
            for allowed in closed:
                for j, (declared, required, _) in enumerate(shapes):
                    if i == j:
                        continue
                    for name in sorted((set(declared) | required) - allowed):
                        how = "requires" if name in required else "declares"
                        problems.append(
                            f"{where}/allOf/{i} is closed (additionalProperties: false) "
                            f"but allOf/{j} {how} `{name}`"
                        )
    return problems


def self_check(doc):
    """The walker must catch the defects it is there for."""
    broken = copy.deepcopy(doc)
    broken.setdefault("components", {}).setdefault("schemas", {})["SelfCheck"] = {
        "allOf": [
            {"type": "object", "properties": {"changes": {"type": "integer"}}},
            {
                "type": "object",
                "required": ["changes", "extra"],
                "properties": {
                    "changes": {"type": "array", "items": {"$ref": "#/components/schemas/Gone"}}
                },
            },
            {"type": "object", "additionalProperties": False, "properties": {"changes": {}}},
            {"type": "object", "properties": {"optional": {"type": "string"}}},
        ]
    }
    _, refs = dangling_refs(broken)
    all_ofs = unsatisfiable_all_ofs(broken)
    if not any("Gone" in p for p in refs):
        fail("self-check: a dangling $ref went unnoticed")
    if not any("`changes` is integer vs array" in p for p in all_ofs):
        fail(f"self-check: an integer/array allOf clash went unnoticed: {all_ofs}")
    if not any("requires `extra`" in p for p in all_ofs):
        fail(f"self-check: a closed allOf branch went unnoticed: {all_ofs}")
    if not any("declares `optional`" in p for p in all_ofs):
        fail(f"self-check: a key refused by a closed allOf branch went unnoticed: {all_ofs}")


def validate(doc):
    from importlib.metadata import version

    from openapi_spec_validator import OpenAPIV31SpecValidator

    errors = list(OpenAPIV31SpecValidator(doc).iter_errors())
    for e in errors[:10]:
        where = "/".join(str(p) for p in getattr(e, "absolute_path", []) or [])
        text = str(getattr(e, "message", e)).splitlines()[0][:300]
        print(f"  #/{where}: {text}", file=sys.stderr)
    if errors:
        fail(f"{len(errors)} error(s) against the OpenAPI 3.1 schema")
    return version("openapi-spec-validator")


TEMPLATE = re.compile(r"\{[^}]*\}")


def operations(doc):
    """Every (method, path) of the document; path parameters written `{}`,
    since the generator may rename them."""
    return {
        (method, TEMPLATE.sub("{}", path))
        for path, item in doc.get("paths", {}).items()
        for method in item
        if method in METHODS
    }


URL = re.compile(r'"url":\s*"([^"]*)"')
METHOD = re.compile(r'"method":\s*"([a-z]+)"')


def generate(document, out, bin_dir):
    from importlib.metadata import version

    config = out.parent / "openapi-client-config.yaml"
    out.parent.mkdir(parents=True, exist_ok=True)
    # No post-generation hooks: the formatter they call is not installed,
    # and its absence would read as a warning. The generator has no reader
    # for image/svg+xml or for a text/csv request body; charts and CSV
    # uploads reach a generated client as bytes.
    config.write_text(
        "post_hooks: []\n"
        "content_type_overrides:\n"
        "  image/svg+xml: application/octet-stream\n"
        "  text/csv: application/octet-stream\n"
    )
    run = subprocess.run(
        [
            str(bin_dir / "openapi-python-client"), "generate",
            "--path", str(document), "--output-path", str(out),
            "--config", str(config), "--meta", "none",
            "--overwrite", "--fail-on-warning",
        ],
        capture_output=True, text=True,
    )
    if run.returncode != 0:
        print(run.stdout + run.stderr, file=sys.stderr)
        fail(f"openapi-python-client failed (exit {run.returncode})")
    found = {}
    for module in sorted((out / "api").rglob("*.py")):
        text = module.read_text()
        url, method = URL.search(text), METHOD.search(text)
        if not (url and method):
            continue
        functions = all(f"def {f}(" in text for f in ("sync_detailed", "asyncio_detailed"))
        if functions:
            found[(method.group(1), TEMPLATE.sub("{}", url.group(1)))] = module.relative_to(out)
    return found, version("openapi-python-client")


def main():
    root = pathlib.Path(__file__).resolve().parent.parent
    document = root / "openapi" / "openapi.json"
    bin_dir = pathlib.Path(sys.executable).parent
    doc = json.loads(document.read_text())
    if not str(doc.get("openapi", "")).startswith("3.1"):
        fail(f"openapi is {doc.get('openapi')!r}, not 3.1")

    self_check(doc)
    validator = validate(doc)
    print(f"OpenAPI 3.1 schema: valid (openapi-spec-validator {validator})")

    count, refs = dangling_refs(doc)
    for p in refs:
        print(f"  {p}", file=sys.stderr)
    if refs:
        fail(f"{len(refs)} of {count} $refs do not resolve")
    print(f"$refs: {count}/{count} resolve")

    all_ofs = unsatisfiable_all_ofs(doc)
    for p in all_ofs[:20]:
        print(f"  {p}", file=sys.stderr)
    if len(all_ofs) > 20:
        print(f"  ... and {len(all_ofs) - 20} more", file=sys.stderr)
    if all_ofs:
        fail(f"{len(all_ofs)} unsatisfiable allOf part(s)")
    print("allOf: none unsatisfiable")

    wanted = operations(doc)
    found, generator = generate(document, root / "target" / "openapi-client" / "tightspec_client", bin_dir)
    missing = sorted(wanted - set(found))
    for method, path in missing:
        print(f"  no endpoint generated for {method.upper()} {path}", file=sys.stderr)
    print(f"generated client (openapi-python-client {generator}): {len(wanted) - len(missing)}/{len(wanted)} endpoints")
    if missing:
        fail(f"{len(missing)} operation(s) without a generated endpoint")


if __name__ == "__main__":
    main()
