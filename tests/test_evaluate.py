"""The headless engine's spreadsheet rules, one formula at a time.

Each row gives a formula, the result the spreadsheet documents for it and the
source of that result.  Sources are Microsoft's Excel help pages, cited by title:
  [OPS]   "Calculation operators and precedence in Excel"
  [ROUND] "ROUND function"; [RUP] "ROUNDUP function"; [RDN] "ROUNDDOWN function"
  [SORT]  "Sort data in a range or table" (default sort order: numbers, text, logical values)
  [FP]    "Floating-point arithmetic may give inaccurate results in Excel" (15 significant digits)
  [SUM]   "SUM function"; [MIN] "MIN function"; [MAX] "MAX function"; [AVG] "AVERAGE function"
  [IFERR] "IFERROR function"; [IFNA] "IFNA function"; [IF] "IF function"; [AND] "AND function"
  [ISF]   "IS functions"; [CONV] "CONVERT function"; [MATCH] "MATCH function"; [INDEX] "INDEX function"
  [ERRS]  "How to correct a #DIV/0! error", "How to correct a #VALUE! error", "How to correct a #NUM! error"
  [FACTS] /work/shared/SPREADSHEET_FACTS.md, behaviour measured on the spreadsheet (LibreOffice differs there)
Conversion factors: [NIST] NIST SP 811 (2008), Appendix B.8/B.9.
"""

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fuelsys.sheet import builtins as bi
from fuelsys.sheet import evaluate as ev
from fuelsys.sheet.builtins import Array, XlError


@pytest.fixture(autouse=True)
def strict(monkeypatch):
    monkeypatch.setattr(ev, "STRICT", True)


def E(text):
    return ev.evaluate_formula(text)


def err(code):
    return bi.error(code)


PRECEDENCE = [
    ("-2^2", 4.0),  # [OPS] negation comes before exponentiation; [FACTS]
    ("0-2^2", -4.0),  # [OPS] subtraction comes after exponentiation
    ("2^3^2", 64.0),  # [OPS] operators of equal precedence go left to right; [FACTS]
    ("2*-3^2", 18.0),  # [OPS] negation before ^ inside a product
    ("5+2*3", 11.0),  # [OPS] * before +
    ("(5+2)*3", 21.0),  # [OPS] parentheses first
    ("10/2/5", 1.0),  # [OPS] left to right
    ("2^-1", 0.5),  # [OPS] a negated exponent
    ("50%", 0.5),  # [OPS] % is "percent" (divide by 100)
    ("2^50%", math.sqrt(2.0)),  # [OPS] % comes before ^
    ("-50%^2", 0.25),  # [OPS] negation, then percent, then ^
    ("1+2&3", "33"),  # [OPS] & comes after + and -
    ('"a"&1+1', "a2"),  # [OPS] & comes after +
    ("1+2=3", True),  # [OPS] comparison comes last
    ("2*3>5", True),  # [OPS] comparison comes last
    ("+-+-1", 1.0),  # [OPS] a chain of signs, each a negation or a plus
]

ROUNDING = [
    ("ROUND(2.15, 1)", 2.2),  # [ROUND] example
    ("ROUND(2.149, 1)", 2.1),  # [ROUND] example
    ("ROUND(-1.475, 2)", -1.48),  # [ROUND] example
    ("ROUND(21.5, -1)", 20.0),  # [ROUND] example
    ("ROUND(626.3, -3)", 1000.0),  # [ROUND] example
    ("ROUND(1.98, -1)", 0.0),  # [ROUND] example
    ("ROUND(-50.55, -2)", -100.0),  # [ROUND] example
    ("ROUND(2.5, 0)", 3.0),  # [ROUND] halves away from zero; [FACTS]
    ("ROUND(-2.5, 0)", -3.0),  # [ROUND] halves away from zero
    ("ROUND(1.005, 2)", 1.01),  # [FACTS] 1.005 to 15 digits rounds up, as the spreadsheet shows
    ("ROUND(0.285, 2)", 0.29),  # [FACTS] same rule (binary 0.28499999...)
    ("ROUND(2.5, 0.9)", 3.0),  # [ROUND] num_digits truncated to a whole number (from memory)
    ("ROUNDUP(3.2, 0)", 4.0),  # [RUP] example
    ("ROUNDUP(-3.14159, 1)", -3.2),  # [RUP] example
    ("ROUNDUP(31415.92654, -2)", 31500.0),  # [RUP] example
    ("ROUNDDOWN(3.14159, 3)", 3.141),  # [RDN] example
    ("ROUNDDOWN(-3.14159, 1)", -3.1),  # [RDN] example
    ("ROUNDDOWN(31415.92654, -2)", 31400.0),  # [RDN] example
]

COMPARISONS = [
    ('"a"="A"', True),  # [OPS]/[SORT] text compares without regard to case
    ('"apple"<"Banana"', True),  # [SORT] alphabetical, case ignored
    ('"abc">999', True),  # [SORT] text sorts after numbers; [FACTS]
    ('"1"=1', False),  # [SORT] a text is never equal to a number
    ("TRUE>\"zzz\"", True),  # [SORT] logical values sort after text; [FACTS]
    ("FALSE>1E+300", True),  # [SORT] logical values sort after numbers
    ("FALSE<TRUE", True),  # [SORT] FALSE before TRUE
    ("0.1+0.2=0.3", True),  # [FP] 15 significant digits; [FACTS]
    ("1+1E-15=1", True),  # [FP] a difference past the 15th digit does not count
    ("1+1E-14=1", False),  # [FP] a difference in the 15th digit counts
    ("3<>3", False),  # [OPS] not equal
    ("(0.3-0.2-0.1)=0", True),  # [FP] a sum that cancels to within the last digits is exactly 0
    ('0.5-0.4-0.1&""', "0"),  # [FP] the documented =(0.5-0.4-0.1) example shows 0
    ("2>=2", True),  # [OPS]
]

JOINS = [
    ('"x"&TRUE', "xTRUE"),  # [FACTS] TRUE joins as the text TRUE (LibreOffice gives "x1")
    ('"a"&1/3', "a0.333333333333333"),  # [FACTS] number to text: 15 significant digits
    ("1&2", "12"),  # [OPS] & joins numbers as texts
    ('"Total: "&1.5', "Total: 1.5"),  # [OPS]
    ('2^50&""', "1.12589990684262E+15"),  # [FP] 15 digits; scientific form (from memory)
    ('0.1+0.2&""', "0.3"),  # [FP] 15 digits hide the binary error
    ('CONCATENATE("a",1,FALSE)', "a1FALSE"),  # [OPS] same rules as &
    ('"x"&-0', "x0"),  # common practice, no source: minus zero joins as 0
]

ERRORS = [
    ("1/0", err("#DIV/0!")),  # [ERRS] dividing by zero
    ("1/0+1", err("#DIV/0!")),  # [ERRS] an error propagates through arithmetic
    ("1/0+NA()", err("#DIV/0!")),  # the first error met (left to right) is the result (from memory)
    ('"a"+1', err("#VALUE!")),  # [ERRS] arithmetic on text that is not a number
    ('"2"+1', 3.0),  # [OPS] a text that is a number converts
    ("SQRT(-1)", err("#NUM!")),  # [ERRS] #NUM!: invalid numeric value
    ("0^0", err("#NUM!")),  # "POWER function": 0^0 is #NUM! (from memory)
    ("(-8)^(1/3)", err("#NUM!")),  # [ERRS] negative base, fractional power
    ("1E+300*1E+300", err("#NUM!")),  # [ERRS] result too large
    ("NA()*2", err("#N/A")),  # [ISF] #N/A propagates
    ('(1/0)&"x"', err("#DIV/0!")),  # [OPS] & propagates errors too
    ("SUM(1,1/0)", err("#DIV/0!")),  # [SUM] an error argument gives the error
    ("#REF!+1", err("#REF!")),  # an error typed in a formula propagates (from memory)
    ("ABS(#VALUE!)", err("#VALUE!")),  # functions propagate errors
    ('FS_HELP("no_such_function")*1', err("#VALUE!")),  # an FS error text is a text: #VALUE! [FACTS]
    ('CONVERT(2.5,"ft","sec")', err("#N/A")),  # [CONV] example: different quantities
    ('CONVERT(1,"bar","Pa")', err("#N/A")),  # [CONV] "bar" is not one of its pressure units
    ('CONVERT("x","m","ft")', err("#VALUE!")),  # [CONV] a number that is not numeric
    ("1=1/0", err("#DIV/0!")),  # comparisons propagate errors (from memory)
]

CATCHING = [
    ('IFERROR(1/0,"x")', "x"),  # [IFERR] returns value_if_error for an error
    ('IFERROR(5,"x")', 5.0),  # [IFERR] otherwise the value
    ("IFERROR(NA(),0)", 0.0),  # [IFERR] #N/A is caught
    ('IFERROR("a"+1,-1)', -1.0),  # [IFERR] #VALUE! is caught
    ("IFNA(NA(),1)", 1.0),  # [IFNA] catches #N/A
    ("IFNA(1/0,1)", err("#DIV/0!")),  # [IFNA] other errors pass
    ("ISERROR(1/0)", True),  # [ISF]
    ("ISERR(NA())", False),  # [ISF] ISERR excludes #N/A
    ("ISNA(NA())", True),  # [ISF]
    ('ISNUMBER(FS_HELP("no_such_function"))', False),  # [ISF]; an FS error text is a text
    ('ISTEXT(FS_HELP("no_such_function"))', True),  # [ISF]
    ('ISNUMBER("1")', False),  # [ISF] a number typed as text is text
    ("ISLOGICAL(1=1)", True),  # [ISF]
    ('IF(1>2,"yes")', False),  # [IF] omitted value_if_false gives FALSE
    ('IF(1<2,"yes","no")', "yes"),  # [IF]
    ('IF("x",1,2)', err("#VALUE!")),  # [IF] a text that is not TRUE/FALSE (from memory)
    ("IF(0,1/0,7)", 7.0),  # [IF] the branch not taken does not matter
    ("CHOOSE(2,10,20,30)", 20.0),  # "CHOOSE function"
    ("CHOOSE(4,10,20,30)", err("#VALUE!")),  # "CHOOSE function": index past the list
]

AGGREGATES = [
    ('SUM(1,"2",TRUE)', 4.0),  # [SUM]/[FACTS] typed text and logical values are counted
    ('SUM({1,"2",TRUE})', 1.0),  # [SUM] text and logical values in an array are ignored
    ('MIN(5,"1")', 1.0),  # [MIN] typed text representation of a number counted
    ('MIN({5,"1"})', 5.0),  # [MIN] text in an array ignored
    ('MIN("a")', err("#VALUE!")),  # [MIN] text that cannot be a number is an error
    ("MAX({1,9;4,2})", 9.0),  # [MAX]
    ('MAX({"a"})', 0.0),  # [MAX] no numbers gives 0
    ('AVERAGE({1,2,"x"})', 1.5),  # [AVG] text in an array ignored
    ('AVERAGE({"x"})', err("#DIV/0!")),  # [AVG] nothing to average (from memory)
    ('COUNT({1,"a",TRUE,2})', 2.0),  # "COUNT function": numbers only in arrays
    ("SUMPRODUCT({1,2,3},{4,5,6})", 32.0),  # "SUMPRODUCT function": 4+10+18
    ("AND(TRUE,TRUE)", True),  # [AND]
    ("AND(TRUE,FALSE)", False),  # [AND]
    ('AND({"a"})', err("#VALUE!")),  # [AND] no logical values: #VALUE!
    ("OR(FALSE,0)", False),  # "OR function"
    ("OR(FALSE,2)", True),  # "OR function": a non-zero number is TRUE
    ("NOT(FALSE)", True),  # "NOT function"
    ("PI()", math.pi),  # "PI function": 3.14159265358979 to 15 digits
    ("ABS(-2.5)", 2.5),  # "ABS function"
    ("SQRT(16)", 4.0),  # "SQRT function" example
    ("MOD(-3,2)", 1.0),  # "MOD function" example: the sign of the divisor
    ("INT(-8.9)", -9.0),  # "INT function" example
    ("LOG(8,2)", 3.0),  # "LOG function" example
    ("ATAN2(1,1)", math.pi / 4),  # "ATAN2 function" example (x_num first)
    ("ROWS({1,2;3,4;5,6})", 3.0),  # "ROWS function"
    ("COLUMNS({1,2;3,4;5,6})", 2.0),  # "COLUMNS function"
    ('LEN("abc")', 3.0),  # "LEN function"
]

LOOKUPS = [
    ("MATCH(39,{25,38,40,41},1)", 2.0),  # [MATCH] example (Bananas 25, Oranges 38, Apples 40, Pears 41)
    ("MATCH(41,{25,38,40,41},0)", 4.0),  # [MATCH] example
    ("MATCH(40,{25,38,40,41},-1)", err("#N/A")),  # [MATCH] example: not in descending order
    ('MATCH("b*",{"apple","Banana"},0)', 2.0),  # [MATCH] wildcards with match_type 0, case ignored
    ('MATCH("x",{"a","b"},0)', err("#N/A")),  # [MATCH] not found
    ('INDEX({"Apples","Lemons";"Bananas","Pears"},2,2)', "Pears"),  # [INDEX] example
    ('INDEX({"Apples","Lemons";"Bananas","Pears"},2,1)', "Bananas"),  # [INDEX] example
    ("INDEX({1,2,3},3)", 3.0),  # [INDEX] one row: the single index is the column
    ("INDEX({1,2,3},4)", err("#REF!")),  # [INDEX] outside the array
]

CONVERSIONS = [
    ('CONVERT(1,"lbm","kg")', 0.45359237),  # [CONV] example; [NIST] pound (avoirdupois) = 0.453 592 37 kg exactly
    ('CONVERT(68,"F","C")', 20.0),  # [CONV] example
    ('CONVERT(CONVERT(100,"ft","m"),"ft","m")', 9.290304),  # [CONV] example: 100 ft² in m²
    ('CONVERT(1,"atm","Pa")', 101325.0),  # [NIST] standard atmosphere = 1.013 25 E+05 Pa exactly
    ('CONVERT(1,"psi","Pa")', 6894.757293168361),  # [NIST] lbf/in² = 6.894 757 E+03 Pa
    ('CONVERT(760,"Torr","atm")', 1.0),  # [NIST] torr = 101 325/760 Pa exactly
    ('CONVERT(1,"mmHg","Pa")', 133.322387415),  # [NIST] mmHg (conventional) = 1.333 224 E+02 Pa
    ('CONVERT(2,"kPa","Pa")', 2000.0),  # [CONV] prefix k = 1E+03
    ('CONVERT(100,"C","K")', 373.15),  # [NIST] T/K = t/°C + 273.15
    ('CONVERT(-40,"C","F")', -40.0),  # [NIST] t/°F = 1.8 t/°C + 32
    ('CONVERT(0,"F","K")', 255.3722222222222),  # [NIST] (0 - 32)/1.8 + 273.15
    ('CONVERT(1,"in","mm")', 25.4),  # [NIST] inch = 2.54 E-02 m exactly; prefix m = 1E-03
    ('CONVERT(1,"ft","m")', 0.3048),  # [NIST] foot = 3.048 E-01 m exactly
    ('CONVERT(1,"lbf","N")', 4.4482216152605),  # [NIST] pound-force = 4.448 222 E+00 N
    ('CONVERT(1,"kg","lbm")', 2.2046226218487757),  # [NIST] 1/0.453 592 37
    ('CONVERT(1,"gal","l")', 3.785411784),  # [NIST] gallon (U.S.) = 3.785 412 E-03 m³ (231 in³)
    ('CONVERT(250,"mL","l")', 0.25),  # [CONV] prefix m on "L"
    ('CONVERT(1,"m3","l")', 1000.0),  # [NIST] litre = 1 E-03 m³
    ('CONVERT(1,"cm3","mL")', 1.0),  # [CONV] a prefix on m3 is cubed
    ('CONVERT(1,"dyn","N")', 1e-5),  # [NIST] dyne = 1.0 E-05 N
    ('CONVERT(1,"BTU","J")', 1055.05585262),  # [NIST] British thermal unit (IT) = 1.055 056 E+03 J
    ('CONVERT(1,"hr","s")', 3600.0),  # [CONV] hour and second
]

ALL = PRECEDENCE + ROUNDING + COMPARISONS + JOINS + ERRORS + CATCHING + AGGREGATES + LOOKUPS + CONVERSIONS


def _same(got, want):
    if isinstance(want, XlError):
        return got == want
    if type(want) is float:
        return type(got) is float and math.isclose(got, want, rel_tol=1e-12, abs_tol=1e-300)
    return type(got) is type(want) and got == want


@pytest.mark.parametrize("formula, expected", ALL, ids=[f for f, _ in ALL])
def test_rule_table(formula, expected):
    got = E(formula)
    assert _same(got, expected), f"{formula}: got {got!r}, expected {expected!r}"


def test_rule_table_rounding_shows_like_the_spreadsheet():
    # [ROUND] ROUND(1.005,2) must show 1.01, not 1 (binary 1.00499999999999989...)
    assert E("ROUND(1.005,2)&\"\"") == "1.01"


def test_array_constant_arithmetic_is_element_wise():
    out = E("{1,2;3,4}*2")  # "Guidelines and examples of array formulas": element by element
    assert isinstance(out, Array) and out.full_rows() == [[2.0, 4.0], [6.0, 8.0]]
    out = E("{1,2,3}+{10;20}")  # a row and a column make a grid ("Dynamic array formulas and spilled array behavior")
    assert out.full_rows() == [[11.0, 12.0, 13.0], [21.0, 22.0, 23.0]]
    out = E("{1,2,3}+{10,20}")  # a smaller array leaves #N/A ("Guidelines and examples of array formulas")
    assert out.full_rows()[0][2] == bi.NA


def test_catalogue_function_is_called_like_a_cell():
    # fuelsys.sheet.call is the reference: the engine must give the same value
    from fuelsys.sheet import call

    assert E("FS_VERSION()") == call("FS_VERSION")
    assert E('FS_HELP("FS_VERSION")') == call("FS_HELP", "FS_VERSION")
    assert E("FS_VERSION()&\"!\"") == call("FS_VERSION") + "!"


def test_catalogue_numbers_broadcast_like_the_adapter():
    from fuelsys.sheet import call, catalogue

    if "FS_DENSITY" not in catalogue.functions():
        pytest.skip("FS_DENSITY is not declared yet")
    # the adapter is the reference for a single cell
    assert E('FS_DENSITY("kerosene", 15)*2') == call("FS_DENSITY", "kerosene", 15.0) * 2
    out = E('FS_DENSITY("kerosene", {15;40})')
    assert isinstance(out, Array) and out.nrows == 2
    assert out.full_rows()[1][0] == call("FS_DENSITY", "kerosene", 40.0)


@pytest.mark.parametrize("formula, word", [
    ("OFFSET(A1,1,1)", "OFFSET"), ("NOW()", "NOW"), ("TODAY()", "TODAY"), ("RAND()", "RAND"),
    ("RANDBETWEEN(1,6)", "RANDBETWEEN"), ('INDIRECT("A1")', "INDIRECT"), ("VLOOKUP(1,{1},1)", "VLOOKUP"),
    ("[1]Sheet1!A1", "external workbook"), ("'[book.xlsx]S'!A1", "external workbook"),
    ("Sheet1:Sheet3!A1", "3-D reference"), ("Table1[Col]", "structured reference"),
    ("SUM((1,2))", "union"), ("SUM(A1:A3 A2:B2)", "intersection"), ("A1:INDEX(B:B,3)", "range built"),
    ("1+", "ends too early"), ("ROUND(1)", "ROUND takes 2"), ("(1", "not closed"),
])
def test_refused_by_name(formula, word):
    with pytest.raises(ev.Unsupported, match="(?i)" + word.replace("[", r"\[").replace("(", r"\(")):
        E(formula)


def test_deep_nesting_is_refused_not_a_crash():
    with pytest.raises(ev.Unsupported, match="nested"):
        E("(" * 2000 + "1" + ")" * 2000)


def test_number_text_rules():
    # [FP] 15 significant digits; the scientific form copies C's %G (from memory)
    assert bi.number_text(1 / 3) == "0.333333333333333"
    assert bi.number_text(123456789012345.0) == "123456789012345"
    assert bi.number_text(1e20) == "1E+20"
    assert bi.number_text(-0.0) == "0"


def test_text_to_number_conversion():
    # [OPS] "=\"1\"+\"2\"" gives 3: text that looks like a number converts for arithmetic
    assert E('"1"+"2"') == 3.0
    assert E('" 2.5e1 "*1') == 25.0
    assert E('"50%"*1') == 0.5
    assert E('""+1') == bi.VALUE  # an empty text is not a number (from memory)


def _match_by_scan(lookup, vals, mt):
    """MATCH with match_type 1 or -1 as [MATCH] describes it, value by value: the position of the
    last value <= (>=) the lookup before the first that is not, on 15 significant digits."""
    best = None
    for i, v in enumerate(vals):
        if type(v) is not float:
            continue
        c = bi.compare(v, lookup)
        if (mt > 0 and c <= 0) or (mt < 0 and c >= 0):
            best = i
        else:
            break
    return bi.NA if best is None else float(best + 1)


_near = st.sampled_from([0.1 + 0.2, 0.3, 1.0, 1.0 + 1e-15, 1.0 + 2e-16, 2.5, -7.0, 1e300])


@settings(max_examples=300, deadline=None)
@given(st.lists(st.one_of(st.floats(-1e6, 1e6, allow_nan=False), _near, st.none(), st.just("x")), max_size=30),
       st.one_of(st.floats(-1e6, 1e6, allow_nan=False), _near), st.sampled_from([1.0, -1.0]),
       st.sampled_from(["sorted", "reversed", "as drawn"]))
def test_match_bisection_agrees_with_the_scan(values, lookup, mt, how):
    nums = sorted(v for v in values if type(v) is float)
    if how != "as drawn":
        it = iter(nums if how == "sorted" else nums[::-1])
        values = [next(it) if type(v) is float else v for v in values]
    arr = bi.Array([[v] for v in values] or [[None]])
    want = _match_by_scan(lookup, [r[0] for r in arr.rows], mt)
    assert bi.fn_match(lookup, arr, mt) == want
    assert bi.fn_match(lookup, arr, mt) == want  # again, from the cached index
