#!/usr/bin/python3
"""Measures candidate face-thickness schemes on the recharged Dupuit strip.

The strip of tests/solver/test_simulation_dupuit.cpp (canals at 20 and 12 m, 1.5 km apart, recharge
2 mm/d, K 20 m/d and k_east beyond the middle) solved by plain cell-centred finite volumes
in numpy/scipy with three face thicknesses: the mean of the two cells' thicknesses with
the harmonic-mean K (the program's `mean`), the harmonic mean of the transmissivities K b,
and the upstream thickness. Prints the worst error against the Dupuit-Forchheimer closed
form (two-zone form derived in postproc/analytical_solutions.hpp) on 25, 12.5 and 6.25 m
cells and the observed orders. Needs Debian's python3-numpy and python3-scipy.
docs/model-format.md ("Face thickness") quotes its output.
"""
import numpy as np
from scipy.optimize import fsolve
h1,h2,N,span,kw=20.0,12.0,2e-3,1500.0,20.0
def exact(x,L,ke,a):
    q0=(0.5*(h1*h1-h2*h2)-N*a*a/(2*kw)-N*(L*L-a*a)/(2*ke))/(a/kw+(L-a)/ke)
    w=lambda s: h1*h1-2/kw*(q0*s+0.5*N*s*s)
    return np.where(x<=a,np.sqrt(np.maximum(w(x),0)),np.sqrt(np.maximum(w(a)-2/ke*(q0*(x-a)+0.5*N*(x*x-a*a)),0)))
def run(dx,ke,scheme):
    n=int(round(span/dx)); e=1e-3
    w=np.array([e]+[dx]*n+[e]); K=np.array([kw if c<=n//2 else ke for c in range(n+2)])
    xc=np.cumsum(w)-w/2; xc-=xc[0]; L=xc[-1]; a=0.5*e+0.5*span
    def faces(h):
        q=np.zeros(n+1)
        for f in range(n+1):
            i,j=f,f+1; bi,bj=h[i],h[j]
            if scheme=='mean':
                F=2*K[i]*K[j]/(K[i]*w[j]+K[j]*w[i]); T=F*(bi+bj)/2
            elif scheme=='harmonicT':
                Ti,Tj=K[i]*bi,K[j]*bj; T=2*Ti*Tj/(Ti*w[j]+Tj*w[i])
            else:
                F=2*K[i]*K[j]/(K[i]*w[j]+K[j]*w[i]); T=F*(bi if h[i]>=h[j] else bj)
            q[f]=T*(h[i]-h[j])  # flow i->j
        return q
    def res(u):
        h=np.concatenate([[h1],u,[h2]]); q=faces(h)
        return q[:-1]-q[1:]+N*w[1:-1]
    u=fsolve(res,np.full(n,16.0),xtol=1e-13)
    return np.max(np.abs(u-exact(xc[1:-1],L,ke,a)))
for ke in (20.0,5.0):
  for s in ('mean','harmonicT','upstream'):
    errs=[run(dx,ke,s) for dx in (25,12.5,6.25)]
    print(f"k_east={ke:4} {s:9} errors {errs[0]:.3e} {errs[1]:.3e} {errs[2]:.3e} orders {np.log2(errs[0]/errs[1]):.2f} {np.log2(errs[1]/errs[2]):.2f}")
