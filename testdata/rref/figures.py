# Exact figures of the decimal data as typed, for stats/exact_test.go:
# rational arithmetic with Python 3's fractions module, each figure rounded
# once to float64 (float(Fraction) is correctly rounded). Sample quantiles
# follow the definitions of Hyndman and Fan (1996) as R's quantile() writes
# them (types 1-9), Tukey's hinges as R's fivenum(); the MAD is 1.4826 times
# the median of |x - median|; the fences are Q1 - k IQR, Q3 + k IQR on the
# type-7 quartiles; G1 and G2 are the adjusted skewness and excess kurtosis
# of Joanes and Gill (1998), g1 = m3/m2^1.5 and b2 = m4/m2^2 (the square
# roots from 60-digit decimals). Also the offset set testdata/sets/25-*.
# Regenerate from the repository root with
#   /usr/bin/python3 testdata/rref/figures.py > testdata/rref/figures.tsv
import glob, os
from fractions import Fraction as F
from decimal import Decimal, getcontext
import math

getcontext().prec = 60

def hf(x, p, t):
    n = len(x)
    def at(k):  # 1-based, clamped
        k = min(max(k, 1), n)
        return x[k - 1]
    if t <= 3:
        nppm = n * p - (F(1, 2) if t == 3 else 0)
        j = math.floor(nppm)
        if t == 1:
            h = 1 if nppm > j else 0
        elif t == 2:
            h = 1 if nppm > j else F(1, 2)
        else:
            h = 1 if (nppm != j or j % 2 == 1) else 0
    else:
        a, b = {4: (0, 1), 5: (F(1, 2), F(1, 2)), 6: (0, 0), 7: (1, 1),
                8: (F(1, 3), F(1, 3)), 9: (F(3, 8), F(3, 8))}[t]
        nppm = a + p * (n + 1 - a - b)
        j = math.floor(nppm)
        h = nppm - j
    lo, hi = at(j), at(j + 1)
    return lo + h * (hi - lo)

def hinges(x):
    n = len(x)
    n4 = F(math.floor(F(n + 3, 2)), 2)
    out = []
    for d in (n4, F(n + 1, 2), n + 1 - n4):
        out.append((x[math.floor(d) - 1] + x[math.ceil(d) - 1]) / 2)
    return out

def median(x):
    n = len(x)
    return x[n // 2] if n % 2 else (x[n // 2 - 1] + x[n // 2]) / 2

def sqrt(fr):
    return float((Decimal(fr.numerator) / Decimal(fr.denominator)).sqrt())

def figures(x):
    x = sorted(x)
    n = len(x)
    out = {}
    probs = [F(1, 4), F(1, 2), F(3, 4), F(135, 100000), F(1, 100), F(5, 100),
             F(95, 100), F(99, 100), F(99865, 100000)]
    for t in range(1, 10):
        for p in probs:
            out["q%d_%s" % (t, float(p))] = hf(x, p, t)
    lo, med, hi = hinges(x)
    out["hinge_lo"], out["hinge_med"], out["hinge_hi"] = lo, med, hi
    m = median(x)
    out["median"] = m
    out["mad"] = F(14826, 10000) * median(sorted(abs(v - m) for v in x))
    q1, q3 = hf(x, F(1, 4), 7), hf(x, F(3, 4), 7)
    iqr = q3 - q1
    out["iqr7"] = iqr
    out["innerLo"], out["innerHi"] = q1 - F(3, 2) * iqr, q3 + F(3, 2) * iqr
    out["outerLo"], out["outerHi"] = q1 - 3 * iqr, q3 + 3 * iqr
    out["beyondInner"] = F(sum(1 for v in x if v < out["innerLo"] or v > out["innerHi"]))
    mean = sum(x) / n
    m2 = sum((v - mean) ** 2 for v in x) / n
    m3 = sum((v - mean) ** 3 for v in x) / n
    m4 = sum((v - mean) ** 4 for v in x) / n
    res = {k: float(v) for k, v in out.items()}
    if m2 > 0 and n >= 4:
        g1sq = m3 * m3 / (m2 ** 3)
        sign = -1 if m3 < 0 else 1
        res["g1"] = sign * sqrt(g1sq)
        res["G1"] = sign * sqrt(g1sq * n * (n - 1) / ((n - 2) ** 2))
        b2 = m4 / (m2 * m2)
        res["b2"] = float(b2)
        res["G2"] = float(F(n - 1, (n - 2) * (n - 3)) * ((n + 1) * (b2 - 3) + 6))
    return res

print("set\tstatistic\tvalue")
files = sorted(glob.glob("testdata/sets/*.txt"))
for f in files:
    xs = [F(l.strip()) for l in open(f) if l.strip()]
    for k, v in figures(xs).items():
        print("%s\t%s\t%r" % (os.path.basename(f), k, v))
