#!/usr/bin/env python3
"""Import cycles between the files of each top-level module of src/, and the layer checks of
DEVELOPERS.md (nothing outside tui::ui imports it; propulsion imports nothing above it).
Run from the repository root: python3 tools/module_cycles.py (comments are ignored)."""
import re,glob,sys
sys.setrecursionlimit(10000)
def modname(path): return path[len("src/"):-3].replace("/","::")
files=glob.glob("src/**/*.rs",recursive=True)
mods={modname(f):f for f in files}
edges={}
for m,f in mods.items():
    s=open(f).read().split("#[cfg(test)]")[0]
    s="\n".join(l.split("//")[0] for l in s.split("\n"))
    deps=set(); parent="::".join(m.split("::")[:-1])
    for rx,base in [(r"crate::([a-z_]+(?:::[a-z_]+)*)",[]),(r"\bsuper::([a-z_]+(?:::[a-z_]+)*)",parent.split("::") if parent else [])]:
        for mm in re.finditer(rx,s):
            path=base+mm.group(1).split("::")
            for k in range(len(path),0,-1):
                cand="::".join(path[:k])
                if cand in mods and cand!=m: deps.add(cand); break
    edges[m]=deps
for top in ["cli","report","profile","tui","study","propulsion","instruments","units"]:
    nodes=set(m for m in mods if m==top or m.startswith(top+"::"))
    index={};low={};st=[];on=set();res=[];c=[0]
    def sc(v):
        index[v]=low[v]=c[0];c[0]+=1;st.append(v);on.add(v)
        for w in edges.get(v,()):
            if w not in nodes: continue
            if w not in index: sc(w); low[v]=min(low[v],low[w])
            elif w in on: low[v]=min(low[v],index[w])
        if low[v]==index[v]:
            comp=[]
            while True:
                w=st.pop();on.discard(w);comp.append(w)
                if w==v: break
            if len(comp)>1: res.append(sorted(comp))
    for v in sorted(nodes):
        if v not in index: sc(v)
    print(top, res)
# layer rule: nothing outside tui::ui imports tui::ui except tui (the loop)
bad=[(m,d) for m,ds in edges.items() for d in ds if d.startswith("tui::ui") and not m.startswith("tui::ui") and m!="tui"]
print("imports of tui::ui from outside:", bad)
# propulsion imports nothing above
print("propulsion upward:", [(m,d) for m,ds in edges.items() if m.startswith("propulsion") for d in ds if not d.startswith("propulsion")])
