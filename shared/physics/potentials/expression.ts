// A safe expression language for external potentials V(x) written by users, e.g. `x^4/4 - 1.5*x^2`,
// `a*r^2 + log(1 + r^2)`. The text is tokenised and checked here, parsed by an isolated mathjs instance, and
// its node tree is checked again against a whitelist; values are computed by closures built from the
// checked tree (mathjs never evaluates user input). Derivatives are symbolic (mathjs `derivative`, the
// rules of elementary calculus, then constant folding); where that fails (min, max, or a point where the symbolic form is 0/0,
// e.g. abs at 0) the five-point central differences
//   f' ≈ (−f(x+2h) + 8f(x+h) − 8f(x−h) + f(x−2h)) / (12h),
//   f'' ≈ (−f(x+2h) + 16f(x+h) − 30f(x) + 16f(x−h) − f(x−2h)) / (12h²),  h = 1e-3·max(1, |x|),
// are used (Abramowitz & Stegun, Handbook of Mathematical Functions, 1964, 25.3.6 and 25.3.24).
// For a radial V = f(r): ∇V = f'(r) x/r and ΔV = f'' + (d − 1) f'/r, with the limit d·f''(0) at r = 0.
import { all, create } from 'mathjs'
import type { ConstantNode, FunctionNode, MathNode, OperatorNode, ParenthesisNode, SymbolNode } from 'mathjs'
import { EngineInputError } from '../errors'
import type { Potential } from './types'

// The isolated instance: used only to parse, differentiate, simplify and print checked trees.
const math = create(all)

export const EXPRESSION_LIMITS = { maxLength: 500, maxNodes: 200, maxDepth: 40 } as const

/** Functions a user may call, with their allowed numbers of arguments. */
const USER_FUNCTIONS: Record<string, [number, number]> = {
  sqrt: [1, 1], exp: [1, 1], log: [1, 1], abs: [1, 1], sin: [1, 1], cos: [1, 1], tan: [1, 1], atan: [1, 1],
  tanh: [1, 1], cosh: [1, 1], sinh: [1, 1], pow: [2, 2], min: [1, 20], max: [1, 20],
}

type Fn = (...args: number[]) => number

/** Functions the compiler evaluates: the user's plus those that symbolic derivatives produce. */
const COMPILED_FUNCTIONS: Record<string, Fn> = {
  sqrt: Math.sqrt, exp: Math.exp, log: Math.log, abs: Math.abs, sin: Math.sin, cos: Math.cos, tan: Math.tan,
  atan: Math.atan, tanh: Math.tanh, cosh: Math.cosh, sinh: Math.sinh, pow: Math.pow, min: Math.min, max: Math.max,
  sec: x => 1 / Math.cos(x), csc: x => 1 / Math.sin(x), cot: x => 1 / Math.tan(x),
  sech: x => 1 / Math.cosh(x), csch: x => 1 / Math.sinh(x), coth: x => 1 / Math.tanh(x),
  sign: Math.sign, square: x => x * x, cube: x => x * x * x, asin: Math.asin, acos: Math.acos,
}

const OPERATORS: Record<string, Fn> = {
  add: (a, b) => a + b,
  subtract: (a, b) => a - b,
  multiply: (a, b) => a * b,
  divide: (a, b) => a / b,
  pow: Math.pow,
  unaryMinus: a => -a,
  unaryPlus: a => a,
}

const COORDINATES = ['x', 'y', 'z'] as const
const CONSTANTS: Record<string, number> = { pi: Math.PI, e: Math.E }

export interface ParseOptions {
  /** Dimension of the points (1, 2 or 3); the coordinates are the first d of x, y, z. */
  d: number
  /** Named numbers the text may use, e.g. { a: 2 }. */
  parameters?: Record<string, number>
}

export interface ParsedPotential extends Potential {
  /** The parameters bound into the expression. */
  readonly parameters: Readonly<Record<string, number>>
  /** The text with the parameter values written in (self-contained). */
  readonly boundText: string
  /** Which derivatives had to fall back to finite differences everywhere (none when symbolic worked). */
  readonly numericalDerivatives: { gradient: boolean, laplacian: boolean }
}

function fail(message: string, position?: number): never {
  throw new EngineInputError(position === undefined ? message : `${message} (at character ${position + 1})`, position === undefined ? {} : { column: position + 1 })
}

const FORBIDDEN: Record<string, string> = {
  '=': 'assignments and comparisons are not allowed',
  '<': 'comparisons are not allowed',
  '>': 'comparisons are not allowed',
  '[': 'arrays and matrices are not allowed',
  ']': 'arrays and matrices are not allowed',
  '{': 'objects are not allowed',
  '}': 'objects are not allowed',
  ':': 'ranges are not allowed',
  '?': 'conditionals are not allowed',
  '"': 'strings are not allowed',
  '\'': 'strings and transposes are not allowed',
  '`': 'strings are not allowed',
  ';': 'only one expression is allowed',
  '\n': 'only one expression is allowed (no line breaks)',
  '\r': 'only one expression is allowed (no line breaks)',
  '!': 'factorials and negations are not allowed',
  '%': 'mod and percent are not allowed',
  '&': 'bitwise operators are not allowed',
  '|': 'bitwise operators are not allowed',
  '~': 'bitwise operators are not allowed',
  '#': 'comments are not allowed',
  '@': 'the character @ is not allowed',
  '$': 'the character $ is not allowed',
  '\\': 'backslashes are not allowed',
}

interface Token { kind: 'number' | 'name' | 'function' | 'symbol', text: string, pos: number }

/** First pass over the text: characters, numbers, names, calls and nesting, each with its position. */
function tokenise(text: string, allowedSymbols: Set<string>, d: number): Token[] {
  const tokens: Token[] = []
  let depth = 0
  let i = 0
  const numberRe = /(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?/y
  const nameRe = /[A-Za-z_][A-Za-z0-9_]*/y
  while (i < text.length) {
    const ch = text[i]
    if (ch === ' ' || ch === '\t') {
      i++
      continue
    }
    if (ch === '(') {
      depth++
      if (depth > EXPRESSION_LIMITS.maxDepth) fail(`parentheses nested deeper than ${EXPRESSION_LIMITS.maxDepth}`, i)
      i++
      continue
    }
    if (ch === ')') {
      depth--
      if (depth < 0) fail('unbalanced parenthesis ")"', i)
      i++
      continue
    }
    if ('+-*/^,'.includes(ch)) {
      if (ch !== '^' && text[i + 1] === ch && ch !== '-' && ch !== '+') fail(`the operator ${ch}${ch} is not allowed`, i)
      i++
      continue
    }
    numberRe.lastIndex = i
    const num = numberRe.exec(text)
    if (num) {
      const value = Number(num[0])
      if (!Number.isFinite(value)) fail(`the number ${num[0]} is not finite`, i)
      tokens.push({ kind: 'number', text: num[0], pos: i })
      i += num[0].length
      continue
    }
    nameRe.lastIndex = i
    const name = nameRe.exec(text)
    if (name) {
      const word = name[0]
      let j = i + word.length
      while (text[j] === ' ' || text[j] === '\t') j++
      if (text[j] === '(') {
        if (!Object.hasOwn(USER_FUNCTIONS, word)) {
          if (allowedSymbols.has(word)) fail(`${word} is not a function; write ${word}*(…) for a product`, i)
          fail(`the function ${word}(…) is not allowed (allowed: ${Object.keys(USER_FUNCTIONS).join(', ')})`, i)
        }
        tokens.push({ kind: 'function', text: word, pos: i })
      }
      else {
        if (!allowedSymbols.has(word)) {
          const k = COORDINATES.indexOf(word as 'x')
          if (k >= d) fail(`${word} is not a coordinate in dimension ${d} (use ${COORDINATES.slice(0, d).join(', ')} or r)`, i)
          if (Object.hasOwn(USER_FUNCTIONS, word)) fail(`the function ${word} must be called with arguments, e.g. ${word}(x)`, i)
          fail(`unknown symbol ${word} (allowed: ${[...allowedSymbols].join(', ')})`, i)
        }
        tokens.push({ kind: 'symbol', text: word, pos: i })
      }
      i += word.length
      continue
    }
    if (ch === '.') fail('property access and element-wise operators are not allowed', i)
    fail(Object.hasOwn(FORBIDDEN, ch) ? FORBIDDEN[ch] : `the character ${JSON.stringify(ch)} is not allowed`, i)
  }
  if (depth !== 0) fail('unbalanced parenthesis "("', text.lastIndexOf('('))
  return tokens
}

function positionOf(tokens: Token[], word: string): number | undefined {
  return tokens.find(t => t.text === word)?.pos
}

function chainGroup(fn: string): string | undefined {
  if (fn === 'add' || fn === 'subtract') return 'sum'
  if (fn === 'multiply' || fn === 'divide') return 'product'
  return undefined
}

/** Second pass over the mathjs tree: node kinds, names, arities, size and depth. */
function checkTree(root: MathNode, allowedSymbols: Set<string>, tokens: Token[]): void {
  let count = 0
  const visit = (node: MathNode, depth: number): void => {
    count++
    if (count > EXPRESSION_LIMITS.maxNodes) fail(`the expression has more than ${EXPRESSION_LIMITS.maxNodes} nodes`)
    if (depth > EXPRESSION_LIMITS.maxDepth) fail(`the expression is nested deeper than ${EXPRESSION_LIMITS.maxDepth}`)
    switch (node.type) {
      case 'ConstantNode': {
        const v = (node as ConstantNode).value as unknown
        if (typeof v !== 'number' || !Number.isFinite(v)) fail(`only finite numbers are allowed as constants (got ${String(v)})`)
        return
      }
      case 'SymbolNode': {
        const name = (node as SymbolNode).name
        if (!allowedSymbols.has(name)) fail(`unknown symbol ${name}`, positionOf(tokens, name))
        return
      }
      case 'ParenthesisNode':
        visit((node as ParenthesisNode).content, depth + 1)
        return
      case 'OperatorNode': {
        const op = node as OperatorNode<never, never>
        if (!Object.hasOwn(OPERATORS, op.fn)) fail(`the operator ${String(op.op)} is not allowed`)
        // a chain of sums (or of products) counts as one level: a + b + c is not "nested"
        for (const a of op.args) {
          const chained = a.type === 'OperatorNode' && chainGroup((a as OperatorNode<never, never>).fn) === chainGroup(op.fn)
          visit(a, chained && chainGroup(op.fn) !== undefined ? depth : depth + 1)
        }
        return
      }
      case 'FunctionNode': {
        const fn = node as FunctionNode<MathNode>
        if (fn.fn.type !== 'SymbolNode') fail('only calls of named functions are allowed')
        const name = (fn.fn as SymbolNode).name
        const arity = Object.hasOwn(USER_FUNCTIONS, name) ? USER_FUNCTIONS[name] : undefined
        if (arity === undefined) fail(`the function ${name}(…) is not allowed`, positionOf(tokens, name))
        if (fn.args.length < arity[0] || fn.args.length > arity[1]) {
          fail(`${name}(…) takes ${arity[0] === arity[1] ? arity[0] : `${arity[0]} to ${arity[1]}`} argument(s), got ${fn.args.length}`, positionOf(tokens, name))
        }
        for (const a of fn.args) visit(a, depth + 1)
        return
      }
      default:
        fail(`${node.type.replace(/Node$/, '').toLowerCase()} expressions are not allowed`)
    }
  }
  visit(root, 0)
}

const TEX_FUNCTIONS: Record<string, string> = {
  exp: '\\exp', log: '\\ln', sin: '\\sin', cos: '\\cos', tan: '\\tan', atan: '\\arctan', tanh: '\\tanh',
  cosh: '\\cosh', sinh: '\\sinh', min: '\\min', max: '\\max',
}

function texNumber(v: number): string {
  const m = /^(-?[\d.]+)e([+-]?\d+)$/.exec(String(v))
  return m ? `${m[1]}\\times 10^{${Number(m[2])}}` : String(v)
}

/**
 * LaTeX of a checked tree, in one pass (mathjs' toTex takes time exponential in the nesting of calls).
 * The user's parentheses are kept; fractions and exponents use braces.
 */
function toLatex(node: MathNode): string {
  switch (node.type) {
    case 'ConstantNode':
      return texNumber((node as ConstantNode).value)
    case 'SymbolNode': {
      const name = (node as SymbolNode).name
      if (name === 'pi') return '\\pi'
      return name.length === 1 ? name : `\\mathrm{${name.replace(/_/g, '\\_')}}`
    }
    case 'ParenthesisNode':
      return `\\left(${toLatex((node as ParenthesisNode).content)}\\right)`
    case 'OperatorNode': {
      const op = node as OperatorNode<never, never>
      const [a, b] = op.args
      const bare = (n: MathNode): string => toLatex(n.type === 'ParenthesisNode' ? (n as ParenthesisNode).content : n)
      switch (op.fn as string) {
        case 'add': return `${toLatex(a)}+${toLatex(b)}`
        case 'subtract': return `${toLatex(a)}-${toLatex(b)}`
        case 'multiply': return op.implicit ? `${toLatex(a)}\\,${toLatex(b)}` : `${toLatex(a)}\\cdot ${toLatex(b)}`
        case 'divide': return `\\frac{${bare(a)}}{${bare(b)}}`
        case 'pow': {
          const base = a.type === 'OperatorNode' ? `\\left(${toLatex(a)}\\right)` : toLatex(a)
          return `{${base}}^{${bare(b)}}`
        }
        case 'unaryMinus': return `-${toLatex(a)}`
        case 'unaryPlus': return `+${toLatex(a)}`
      }
      return op.args.map(toLatex).join(String(op.op))
    }
    case 'FunctionNode': {
      const fn = node as FunctionNode<MathNode>
      const name = (fn.fn as SymbolNode).name
      const args = fn.args.map(toLatex)
      if (name === 'sqrt') return `\\sqrt{${args[0]}}`
      if (name === 'abs') return `\\left|${args[0]}\\right|`
      if (name === 'pow') return `{\\left(${args[0]}\\right)}^{${args[1]}}`
      return `${TEX_FUNCTIONS[name] ?? `\\operatorname{${name}}`}\\left(${args.join(', ')}\\right)`
    }
    default:
      return ''
  }
}

type Compiled = (vars: Float64Array) => number

/** Builds a closure tree for a checked tree (also for derivative trees). Returns undefined for anything else. */
function compileTree(node: MathNode, bindings: Record<string, number>): Compiled | undefined {
  switch (node.type) {
    case 'ConstantNode': {
      const v = (node as ConstantNode).value as unknown
      return typeof v === 'number' ? () => v : undefined
    }
    case 'SymbolNode': {
      const name = (node as SymbolNode).name
      const k = name === 'r' ? 3 : COORDINATES.indexOf(name as 'x')
      if (k >= 0) return vars => vars[k]
      if (Object.hasOwn(bindings, name)) {
        const v = bindings[name]
        return () => v
      }
      return undefined
    }
    case 'ParenthesisNode':
      return compileTree((node as ParenthesisNode).content, bindings)
    case 'OperatorNode': {
      const op = node as OperatorNode<never, never>
      const f = Object.hasOwn(OPERATORS, op.fn) ? OPERATORS[op.fn] : undefined
      const args = op.args.map(a => compileTree(a, bindings))
      if (f === undefined || args.some(a => a === undefined)) return undefined
      const [a, b] = args as Compiled[]
      if (args.length === 1) return vars => f(a(vars))
      if (args.length === 2) return vars => f(a(vars), b(vars))
      return vars => (args as Compiled[]).map(g => g(vars)).reduce((p, q) => f(p, q))
    }
    case 'FunctionNode': {
      const fn = node as FunctionNode<MathNode>
      if (fn.fn.type !== 'SymbolNode') return undefined
      const name = (fn.fn as SymbolNode).name
      const f = Object.hasOwn(COMPILED_FUNCTIONS, name) ? COMPILED_FUNCTIONS[name] : undefined
      const args = fn.args.map(a => compileTree(a, bindings))
      if (f === undefined || args.some(a => a === undefined)) return undefined
      const cs = args as Compiled[]
      const [a, b] = cs
      if (cs.length === 1) return vars => f(a(vars))
      if (cs.length === 2) return vars => f(a(vars), b(vars))
      return vars => f(...cs.map(g => g(vars)))
    }
    default:
      return undefined
  }
}

/** Nodes of the tree (shared subtrees counted each time they occur), stopping once above limit. */
function countNodesUpTo(node: MathNode, limit: number): number {
  let n = 0
  const walk = (m: MathNode): void => {
    if (n > limit) return
    n++
    m.forEach(child => walk(child))
  }
  walk(node)
  return n
}

const isConst = (n: MathNode): n is ConstantNode => n.type === 'ConstantNode' && typeof (n as ConstantNode).value === 'number'
const constValue = (n: MathNode): number | undefined => (isConst(n) ? (n as ConstantNode).value : undefined)

/**
 * A linear-time tidy-up of a derivative tree: folds constant operations and drops ×1, +0, /1, ^1 and
 * parentheses (mathjs' own simplifiers can take exponential time on long sums, so they are not used).
 */
function tidy(node: MathNode): MathNode {
  if (node.type === 'ParenthesisNode') return tidy((node as ParenthesisNode).content)
  if (node.type === 'FunctionNode') {
    const fn = node as FunctionNode<MathNode>
    return new math.FunctionNode(fn.fn, fn.args.map(tidy))
  }
  if (node.type !== 'OperatorNode') return node
  const op = node as OperatorNode<never, never>
  const args = op.args.map(tidy)
  const vals = args.map(constValue)
  const f = Object.hasOwn(OPERATORS, op.fn) ? OPERATORS[op.fn] : undefined
  if (f !== undefined && vals.every(v => v !== undefined)) {
    const v = (vals as number[]).reduce((p, q) => f(p, q))
    if (args.length === 1) return new math.ConstantNode(f(vals[0] as number))
    if (Number.isFinite(v)) return new math.ConstantNode(v)
  }
  if (args.length === 2) {
    const [a, b] = args
    const [va, vb] = vals
    switch (op.fn as string) {
      case 'multiply':
        if (va === 0 || vb === 0) return new math.ConstantNode(0)
        if (va === 1) return b
        if (vb === 1) return a
        break
      case 'add':
        if (va === 0) return b
        if (vb === 0) return a
        break
      case 'subtract':
        if (vb === 0) return a
        break
      case 'divide':
        if (vb === 1) return a
        break
      case 'pow':
        if (vb === 1) return a
        if (vb === 0) return new math.ConstantNode(1)
        break
    }
  }
  return new math.OperatorNode(op.op, op.fn, args, op.implicit)
}

/** Symbolic derivative (tidied); undefined when mathjs cannot differentiate it or it grows too big. */
function differentiate(node: MathNode, variable: string): MathNode | undefined {
  try {
    const raw = math.derivative(node, variable, { simplify: false })
    if (countNodesUpTo(raw, 5000) > 5000) return undefined
    return tidy(raw)
  }
  catch {
    return undefined
  }
}

function usesSymbol(node: MathNode, names: string[]): boolean {
  let found = false
  node.traverse((n) => {
    if (n.type === 'SymbolNode' && names.includes((n as SymbolNode).name)) {
      // a function's name is also a SymbolNode; it never equals a coordinate here (checked before)
      found = true
    }
  })
  return found
}

function stepFor(x: number): number {
  return 1e-3 * Math.max(1, Math.abs(x))
}

function fivePointFirst(f: (s: number) => number, x: number): number {
  const h = stepFor(x)
  return (-f(x + 2 * h) + 8 * f(x + h) - 8 * f(x - h) + f(x - 2 * h)) / (12 * h)
}

function fivePointSecond(f: (s: number) => number, x: number): number {
  const h = stepFor(x)
  return (-f(x + 2 * h) + 16 * f(x + h) - 30 * f(x) + 16 * f(x - h) - f(x - 2 * h)) / (12 * h * h)
}

/**
 * Parses a user's potential, e.g. parsePotential('a*r^2 + x', { d: 2, parameters: { a: 2 } }).
 * Throws EngineInputError naming what was rejected and at which character.
 */
export function parsePotential(text: string, options: ParseOptions): ParsedPotential {
  const { d } = options
  if (d !== 1 && d !== 2 && d !== 3) throw new EngineInputError(`a potential needs dimension d = 1, 2 or 3 (got ${String(d)})`)
  if (typeof text !== 'string') throw new EngineInputError('the potential must be given as text')
  if (text.length > EXPRESSION_LIMITS.maxLength) fail(`the expression is longer than ${EXPRESSION_LIMITS.maxLength} characters`, EXPRESSION_LIMITS.maxLength)
  if (text.trim().length === 0) throw new EngineInputError('the potential is empty')
  const parameters: Record<string, number> = {}
  const reserved = new Set<string>([...COORDINATES, 'r', ...Object.keys(CONSTANTS), ...Object.keys(COMPILED_FUNCTIONS)])
  for (const [name, value] of Object.entries(options.parameters ?? {})) {
    if (!/^[A-Za-z_][A-Za-z0-9_]*$/.test(name)) throw new EngineInputError(`the parameter name ${JSON.stringify(name)} is not a valid name (letters, digits, _)`)
    if (reserved.has(name)) throw new EngineInputError(`the parameter name ${name} is reserved (coordinates, r, pi, e and function names)`)
    if (typeof value !== 'number' || !Number.isFinite(value)) throw new EngineInputError(`the parameter ${name} must be a finite number (got ${String(value)})`)
    parameters[name] = value
  }
  const coords = COORDINATES.slice(0, d) as string[]
  const allowedSymbols = new Set<string>([...coords, 'r', ...Object.keys(CONSTANTS), ...Object.keys(parameters)])
  const tokens = tokenise(text, allowedSymbols, d)
  let tree: MathNode
  try {
    tree = math.parse(text)
  }
  catch (err) {
    const at = (err as { char?: unknown }).char
    fail(`the expression could not be read: ${(err as Error).message}`, typeof at === 'number' ? Math.max(0, at - 1) : undefined)
  }
  checkTree(tree, allowedSymbols, tokens)
  const bindings: Record<string, number> = { ...CONSTANTS, ...parameters }
  const valueFn = compileTree(tree, bindings)
  if (valueFn === undefined) fail('the expression could not be compiled')
  const canonical = tree.toString()
  const boundTree = tree.transform(n => (n.type === 'SymbolNode' && Object.hasOwn(parameters, (n as SymbolNode).name)
    ? new math.ConstantNode(parameters[(n as SymbolNode).name])
    : n))
  const radial = !usesSymbol(tree, coords)
  const latex = toLatex(tree)

  const vars = new Float64Array(4)
  const load = (points: ArrayLike<number>, offset: number): void => {
    let r2 = 0
    for (let i = 0; i < 3; i++) {
      if (i < d) {
        const c = points[offset + i]
        if (typeof c !== 'number' || !Number.isFinite(c)) {
          throw new EngineInputError(`coordinate ${i} of the point at offset ${offset} is not a finite number`, { index: Math.floor(offset / d) })
        }
        vars[i] = c
        r2 += c * c
      }
      else {
        vars[i] = 0
      }
    }
    vars[3] = Math.sqrt(r2)
  }
  const value = (points: ArrayLike<number>, offset = 0): number => {
    load(points, offset)
    const v = valueFn(vars)
    // ±∞ is a value (e.g. −log r at the origin); NaN means V is undefined there (e.g. sqrt(x) for x < 0)
    if (Number.isNaN(v)) {
      throw new EngineInputError(`the potential ${canonical} is undefined (NaN) at the point with index ${Math.floor(offset / d)}`, { index: Math.floor(offset / d) })
    }
    return v
  }
  const numerical = { gradient: false, laplacian: false }

  if (radial) {
    // V = f(r): differentiate in r; f is extended evenly to r < 0 for finite differences near the origin.
    const fv = new Float64Array(4)
    const f = (s: number): number => {
      fv[3] = Math.abs(s)
      return valueFn(fv)
    }
    const t1 = differentiate(tree, 'r')
    const d1c = t1 ? compileTree(t1, bindings) : undefined
    const t2 = t1 ? differentiate(t1, 'r') : undefined
    const d2c = t2 ? compileTree(t2, bindings) : undefined
    numerical.gradient = d1c === undefined
    numerical.laplacian = d2c === undefined
    const rv = new Float64Array(4)
    const symbolic = (c: Compiled | undefined, r: number): number => {
      if (c === undefined) return NaN
      rv.fill(0)
      rv[3] = r
      return c(rv)
    }
    const dv = (r: number): number => {
      const s = symbolic(d1c, r)
      return Number.isFinite(s) ? s : fivePointFirst(f, r)
    }
    const d2v = (r: number): number => {
      const s = symbolic(d2c, r)
      return Number.isFinite(s) ? s : fivePointSecond(f, r)
    }
    const lapAt = (r: number): number => {
      if (r > 0) return d2v(r) + (d - 1) * dv(r) / r
      const slope = dv(0)
      if (Math.abs(slope) < 1e-12) return d * d2v(0)
      return Math.sign(slope) * Infinity
    }
    return {
      d,
      text: canonical,
      boundText: boundTree.toString(),
      latex,
      radial: true,
      parameters,
      numericalDerivatives: numerical,
      value,
      gradient(points, offset, out) {
        load(points, offset)
        const r = vars[3]
        const k = r > 0 ? dv(r) / r : 0
        for (let i = 0; i < d; i++) out[i] = k * points[offset + i]
      },
      laplacian(points, offset = 0) {
        load(points, offset)
        return lapAt(vars[3])
      },
      radialProfile: {
        v: (r: number) => f(r),
        dv,
        d2v,
      },
    }
  }

  // General V(x, y, z): r is written out as sqrt(x² + …) before differentiating.
  const radius = math.parse(`sqrt(${coords.map(c => `${c}^2`).join(' + ')})`)
  const expanded = tree.transform(n => (n.type === 'SymbolNode' && (n as SymbolNode).name === 'r' ? radius.cloneDeep() : n))
  const firsts: Array<Compiled | undefined> = []
  const seconds: Array<Compiled | undefined> = []
  for (const c of coords) {
    const t1 = differentiate(expanded, c)
    firsts.push(t1 ? compileTree(t1, bindings) : undefined)
    const t2 = t1 ? differentiate(t1, c) : undefined
    seconds.push(t2 ? compileTree(t2, bindings) : undefined)
  }
  numerical.gradient = firsts.some(c => c === undefined)
  numerical.laplacian = seconds.some(c => c === undefined)
  const along = (i: number): ((s: number) => number) => {
    const base = Float64Array.from(vars)
    const w = new Float64Array(4)
    return (s: number): number => {
      w.set(base)
      w[i] = s
      w[3] = Math.sqrt(w[0] * w[0] + w[1] * w[1] + w[2] * w[2])
      return valueFn(w)
    }
  }
  return {
    d,
    text: canonical,
    boundText: boundTree.toString(),
    latex,
    radial: false,
    parameters,
    numericalDerivatives: numerical,
    value,
    gradient(points, offset, out) {
      load(points, offset)
      for (let i = 0; i < d; i++) {
        const c = firsts[i]
        const s = c === undefined ? NaN : c(vars)
        out[i] = Number.isFinite(s) ? s : fivePointFirst(along(i), vars[i])
      }
    },
    laplacian(points, offset = 0) {
      load(points, offset)
      let sum = 0
      for (let i = 0; i < d; i++) {
        const c = seconds[i]
        const s = c === undefined ? NaN : c(vars)
        sum += Number.isFinite(s) ? s : fivePointSecond(along(i), vars[i])
      }
      return sum
    },
  }
}
