# Exact mean, variance (n-1) and SD of the decimal data as typed, for
# stats/rref_test.go and stats/nist_test.go: rational arithmetic with
# Python 3's fractions module, the SD rounded from a 60-digit decimal square
# root. Regenerate from the repository root with
#   /usr/bin/python3 testdata/rref/exact.py > testdata/rref/exact.tsv
import glob, os
from fractions import Fraction
from decimal import Decimal, getcontext

getcontext().prec = 60

def exact(path):
    xs = [Fraction(l.strip()) for l in open(path) if l.strip()]
    n = len(xs)
    m = sum(xs) / n
    ss = sum((x - m) ** 2 for x in xs)
    var = ss / (n - 1)
    sd = (Decimal(var.numerator) / Decimal(var.denominator)).sqrt()
    return n, m, var, sd

print("set\tn\tmean\tvar\tsd")
files = sorted(glob.glob("testdata/sets/*.txt")) + sorted(glob.glob("testdata/nist/*.dat"))
for f in files:
    n, m, var, sd = exact(f)
    print("%s\t%d\t%r\t%r\t%r" % (os.path.basename(f), n, float(m), float(var), float(sd)))
