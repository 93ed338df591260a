# Independent reference for Neuman (1974): the same Laplace-domain solution with complex p,
# the eigenvalues e tan e = alpha found by scipy.optimize.newton in the complex plane, and
# inverted by the fixed Talbot method (Abate and Valko, 2004).
import numpy as np
from scipy.optimize import newton
from scipy.special import kv

def eig(n, alpha):
    # Start from the root for |alpha| (real), continued to complex alpha by Newton.
    h = lambda e: e*np.sin(e) - alpha*np.cos(e)
    dh = lambda e: (1+alpha)*np.sin(e) + e*np.cos(e)
    a = abs(alpha)
    x0 = np.sqrt(alpha) if n == 0 else n*np.pi + np.arctan(alpha/(n*np.pi)) if False else None
    if n == 0:
        x0 = np.sqrt(alpha) if a < 1 else np.pi/2*(1 - 1/(1+np.sqrt(alpha)))+0j
        x0 = np.sqrt(alpha)/np.sqrt(1+alpha/3) if True else x0
    else:
        x0 = n*np.pi + alpha/(n*np.pi + alpha/(n*np.pi+np.pi/4))
    return newton(h, x0, fprime=dh, tol=1e-14, maxiter=200)

def sbar(T, S, Sy, L, r, p):
    alpha = Sy*p*L*L/T
    tot = 0
    for n in range(400):
        e = eig(n, alpha)
        w = 2*np.sin(e)**2/(e*(e+np.sin(e)*np.cos(e)))
        term = w*kv(0, r*np.sqrt(e*e/L/L + S*p/T))
        tot += term
        if n > 5 and abs(term) < 1e-14*abs(tot): break
    return tot/(2*np.pi*T*p)

def talbot(F, t, M=32):
    r = 2*M/(5*t)
    tot = 0.5*np.exp(r*t)*F(r).real
    for k in range(1, M):
        th = k*np.pi/M
        cot = np.cos(th)/np.sin(th)
        s = r*th*(cot + 1j)
        sig = th + (th*cot - 1)*cot
        tot += (np.exp(t*s)*F(s)*(1 + 1j*sig)).real
    return r/M*tot

T, S, Sy, L, r = 200.0, 2e-4, 0.15, 30.0, 15.0   # m2/d, -, -, m, m (invented)
# Only t = 1 and 10 d are used: at earlier times this simple complex Newton can land on the
# wrong eigenvalue branch, which the printed values then show as a non-monotone curve.
for t in (1.0, 10.0):
    print(t, "%.10g" % talbot(lambda p: sbar(T, S, Sy, L, r, p), t))
